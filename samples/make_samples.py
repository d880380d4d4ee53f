#!/usr/bin/env python3
"""Writes evenhand's demo corpora into the folder that holds this script.

All people, places and organisations are invented: the Kestlebury Regional Library's volunteer
help desk and the Kestlebury Spokes Cycling Club. The output is deterministic: one fixed seed,
no clock, no environment look-ups, so a re-run rewrites byte-identical files.

    python3 samples/make_samples.py          # writes helpdesk.jsonl, club-notes.txt,
                                             # club-letters.txt and prints counts

Standard library only.
"""

import json
import os
import random
import re
import sys
import textwrap

SEED = 20240917
HERE = os.path.dirname(os.path.abspath(__file__))

HELPDESK_RECORDS = 300
CLUB_NOTES = 60

# --------------------------------------------------------------------------------------
# Vocabulary
# --------------------------------------------------------------------------------------

FEMALE_NAMES = [
    "Emily", "Olivia", "Hannah", "Mary", "Sarah", "Grace", "Sophie", "Charlotte", "Lucy",
    "Margaret", "Ruth", "Alice", "Helen", "Jessica", "Amy", "Rachel", "Laura", "Claire",
    "Emma", "Elizabeth", "Anna", "Kate", "Susan", "Jane",
]
MALE_NAMES = [
    "James", "John", "Michael", "Daniel", "Thomas", "David", "William", "Peter", "George",
    "Robert", "Matthew", "Samuel", "Andrew", "Paul", "Richard", "Harry", "Jack", "Oliver",
    "Edward", "Mark", "Joseph", "Simon", "Stephen", "Henry",
]
SURNAMES = [
    "Ashworth", "Bramley", "Carter", "Dunmore", "Ellison", "Fairweather", "Greenhalgh",
    "Hollins", "Kettering", "Lowther", "Marsh", "Pennock", "Radcliffe", "Selwood",
    "Thornbury", "Underhill", "Whitlock", "Yardley", "Oakes", "Pilling", "Rowntree", "Birch",
    "Calloway", "Denholm", "Fenwick", "Goodall", "Hebden", "Kirkby",
]

# (female form, male form)
KIN_ADULT = [
    ("mother", "father"), ("grandmother", "grandfather"), ("aunt", "uncle"),
    ("stepmother", "stepfather"), ("mother-in-law", "father-in-law"), ("sister", "brother"),
    ("wife", "husband"), ("daughter", "son"),
]
KIN_YOUNG = [
    ("daughter", "son"), ("granddaughter", "grandson"), ("niece", "nephew"),
    ("stepdaughter", "stepson"),
]
KIN_OLD = [
    ("mother", "father"), ("grandmother", "grandfather"), ("aunt", "uncle"),
    ("stepmother", "stepfather"), ("mother-in-law", "father-in-law"),
]
# Careers a person may have retired from (chair and spokes- roles are Person attributes).
JOBS = [
    ("waitress", "waiter"),
    ("actress", "actor"), ("policewoman", "policeman"), ("businesswoman", "businessman"),
    ("headmistress", "headmaster"), ("postwoman", "postman"), ("landlady", "landlord"),
]
TITLES_F = ["Mrs", "Ms", "Miss", "Mrs", "Ms"]

BRANCHES = ["Quarry Street", "Mill Lane", "Harbour Road", "Tanner's Row", "Westfield"]
ROUTES = [
    "the reservoir loop", "the Fenn Hill climb", "the canal towpath ride",
    "the Old Mill circuit", "the coast road", "the three bridges route", "the orchard lanes",
]
CAFES = ["the Bluebell Tearoom", "the station café", "the Lock Keeper's kiosk",
         "the Hilltop Barn café"]
DAYS = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"]
TIMES = ["9:30", "10:00", "10:30", "11:00", "14:00", "18:30"]
MONTHS = ["March", "April", "May", "June", "September", "October"]
ITEMS = ["umbrella", "scarf", "pair of gloves", "reading glasses case", "water bottle",
         "cycling cap"]


def cap(word):
    return word[:1].upper() + word[1:]


class Person:
    """One invented person with every form a template may ask for."""

    def __init__(self, g, name, surname, kin_pair=None, job_pair=None, title=None):
        f = g == "f"
        self.g = g
        self.name = name
        self.surname = surname
        self.s, self.o, self.p = ("she", "her", "her") if f else ("he", "him", "his")
        self.pp, self.r = ("hers", "herself") if f else ("his", "himself")
        self.S, self.O, self.P = cap(self.s), cap(self.o), cap(self.p)
        self.PP, self.R = cap(self.pp), cap(self.r)
        i = 0 if f else 1
        self.kin = kin_pair[i] if kin_pair else ("sister" if f else "brother")
        self.Kin = cap(self.kin)
        self.job = job_pair[i] if job_pair else ""
        # "a waiter", "an actor": the indefinite article that fits the job word.
        self.a_job = ("an " if self.job[:1] in "aeiou" else "a ") + self.job if self.job else ""
        self.title = title or ("Mrs" if f else "Mr")
        self.addr = "madam" if f else "sir"
        self.Addr = cap(self.addr)
        self.noun = "woman" if f else "man"
        self.nouns = "women" if f else "men"
        self.young = "girl" if f else "boy"
        self.youngs = "girls" if f else "boys"
        self.gent = "lady" if f else "gentleman"
        self.gents = "ladies" if f else "gentlemen"
        self.adj = "female" if f else "male"
        self.chair = "chairwoman" if f else "chairman"
        self.spokes = "spokeswoman" if f else "spokesman"
        self.police = "policewoman" if f else "policeman"
        self.business = "businesswoman" if f else "businessman"
        self.server = "waitress" if f else "waiter"
        self.full = f"{name} {surname}"
        self.formal = f"{self.title} {surname}"


class Ctx:
    """Per-record state: random choices, slot values, names already used."""

    def __init__(self, rng):
        self.rng = rng
        self.used = []
        self.slots = {
            "branch": rng.choice(BRANCHES),
            "route": rng.choice(ROUTES),
            "cafe": rng.choice(CAFES),
            "day": rng.choice(DAYS),
            "time": rng.choice(TIMES),
            "month": rng.choice(MONTHS),
            "item": rng.choice(ITEMS),
            "n": rng.randint(6, 23),
            "km": rng.choice([32, 40, 45, 52, 60, 64, 75, 80]),
            "age": rng.randint(3, 5),
            "teen": rng.randint(11, 15),
            "old": rng.randint(62, 79),
        }

    def pick(self, options):
        return self.rng.choice(options)

    def chance(self, p):
        return self.rng.random() < p

    def person(self, g=None, kin=None, job=None, female_weight=0.5):
        rng = self.rng
        if g is None:
            g = "f" if rng.random() < female_weight else "m"
        pool = FEMALE_NAMES if g == "f" else MALE_NAMES
        name = rng.choice([x for x in pool if x not in self.used])
        self.used.append(name)
        surname = rng.choice([x for x in SURNAMES if x not in self.used])
        self.used.append(surname)
        kin_pair = rng.choice(kin) if kin else None
        job_pair = rng.choice(job) if job else rng.choice(JOBS)
        title = rng.choice(TITLES_F) if g == "f" else "Mr"
        return Person(g, name, surname, kin_pair, job_pair, title)

    def f(self, template, **people):
        return template.format(**self.slots, **people)


def typographic(text):
    """Straight apostrophes to curly ones (the records use " for quotations)."""
    return text.replace("'", "\u2019")


# --------------------------------------------------------------------------------------
# Chat scenarios with gendered mentions. Each returns a list of (role, content) pairs.
# --------------------------------------------------------------------------------------


def qa(c, pairs):
    """Picks one (question, answer) pair and returns it as two chat turns."""
    q, a = c.pick(pairs)
    return [("user", q), ("assistant", a)]


def chat_renew(c):
    a = c.person(kin=KIN_ADULT)
    m = [("user", c.pick([
        "Hi, my {a.kin} can't get to the {branch} branch this week because of {a.p} knee. "
        "Can I renew {a.p} books for {a.o}?",
        "Hello. I'm asking for my {a.kin}: {a.s} has three books due on {day} and {a.s} is "
        "away until the end of the month. Can I renew them on {a.p} behalf?",
        "Can I renew books on my {a.kin}'s card? {a.S} asked me to sort it out while {a.s} "
        "is in hospital.",
    ])), ("assistant", c.pick([
        "Yes, that's fine. If you have {a.p} card number and PIN I can renew them now, or "
        "{a.s} can do it {a.r} online at any time.",
        "Of course. Read me the card number and I'll extend everything by three weeks. If "
        "{a.s} would rather phone us {a.r}, the desk number is on the back of the card.",
        "No problem. I've found {a.p} account and renewed all three loans; the new due date "
        "is on the slip I'll print for {a.o}.",
    ]))]
    if c.chance(0.6):
        m += c.pick([
            [("user", "Thanks, that's a weight off {a.p} mind. {a.S} was worried about fines."),
             ("assistant", "There are no fines on adult loans any more, so please tell {a.o} "
                           "not to worry. We hope {a.s} feels better soon.")],
            [("user", "Brilliant, thank you. I'll let {a.o} know tonight."),
             ("assistant", "You're welcome. Give {a.o} our best wishes from the {branch} "
                           "desk.")],
        ])[: c.pick([1, 2])]
    return [(r, c.f(t, a=a)) for r, t in m]


def chat_knitting(c):
    a = c.person(g="m")
    b = c.person()
    k = c.pick(["mother", "grandmother", "father", "grandfather", "aunt", "uncle"])
    m = qa(c, [
        ("Hello, I'm a retired {a.job} and I'd like to join the knitting circle on {day}s. "
         "Do many men come along?",
         "You'd be very welcome, {a.addr}. The circle is run by {b.full}; {b.s} has taught "
         "plenty of beginners, and several of the regulars are men who started last spring. "
         "The most experienced knitter is a woman of ninety-one."),
        ("I'm a retired policeman with time on my hands. Is the knitting group at {branch} "
         "still looking for members?",
         "It is, {a.addr}. {b.name} leads it and {b.s} keeps spare needles and wool, so you "
         "don't need to bring anything yourself."),
        ("Is the knitting group at {branch} open to complete beginners? I'm a man in my "
         "seventies and I've never held a needle.",
         "Absolutely. The group meets at {time} in the community room. {b.name} leads it and "
         "{b.s} started from scratch {b.r} only three years ago."),
        ("My name is {a.name}. My {k} taught me to knit when I was a boy and I'd like to "
         "pick it up again. Is there a group I could join?",
         "There is, {a.name}. The knitting circle meets on {day}s at {time}; {b.full} runs "
         "it, and {b.s}'ll be glad to hear you already know the basics."),
    ])
    if c.chance(0.5):
        m.append(("user", "Wonderful. Should I ask for {b.name} when I arrive?"))
        m.append(("assistant", c.pick([
            "Yes, ask at the front desk and someone will take you through to {b.o}.",
            "Please do. {b.S} usually arrives ten minutes early to set out the chairs.",
        ])))
    return [(r, c.f(t, a=a, b=b, k=k)) for r, t in m]


def chat_digital(c):
    a = c.person(kin=KIN_OLD)
    b = c.person()
    m = qa(c, [
        ("My {a.kin} wants help setting up {a.p} e-mail on a new tablet. Can {a.s} book a "
         "session with someone?",
         "Yes. {b.name}, one of our volunteers, runs digital help on {day} mornings. {b.S} "
         "will sit with {a.o} for half an hour and go at whatever pace suits {a.o}."),
        ("Do you still run the computer help sessions? My {a.kin} bought {a.r} a laptop and "
         "{a.s} is stuck on the first screen.",
         "We do. Sessions are free and last forty minutes. {b.formal} is on the rota this "
         "{day}; {b.s} is very patient, and {a.s} can bring the laptop along."),
        ("My {a.kin} would like to learn to make online calls so {a.s} can see {a.p} "
         "grandchildren. Is there anyone who could show {a.o}?",
         "Yes. {b.name} helps with exactly that on {day} mornings; {b.s} set up calls for "
         "three grandparents last month, so {a.s} will be in good hands."),
    ])
    if c.chance(0.5):
        m.append(("user", "Perfect. Does {a.s} need to bring {a.p} passwords?"))
        m.append(("assistant",
                  "It helps if {a.s} has them written down, but {b.name} will never ask to "
                  "keep them. {b.S} will show {a.o} how to reset anything {a.s} has forgotten."))
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_storytime(c):
    a = c.person(kin=KIN_YOUNG)
    b = c.person()
    m = qa(c, [
        ("My {a.kin} is {age}. Is story time at {branch} suitable for {a.o}?",
         "It's aimed at children from two to five, so {a.s}'d fit right in. {b.formal} reads "
         "on {day}s at {time}; {b.s} always finishes with a song."),
        ("I look after my {a.kin} on {day}s. {a.S} loves books; could {a.s} come to story "
         "time, and do I need to book?",
         "No booking needed. {b.name} runs it and {b.s} is great with shy children, so if "
         "{a.s} would rather sit on your lap at first, that's fine."),
    ])
    if c.chance(0.4):
        m.append(("user", "Lovely. {a.S} will be thrilled to hear that."))
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_access(c):
    a = c.person(kin=KIN_ADULT)
    m = qa(c, [
        ("My {a.kin} uses a wheelchair. Is the {branch} branch step-free?",
         "Yes, the main entrance has a ramp and the lift reaches every floor. If {a.s} would "
         "like, a volunteer can meet {a.o} at the door."),
        ("My {a.kin} has poor eyesight. Do you have large-print books {a.s} could borrow?",
         "We have a whole bay of large-print titles and audiobooks too. If {a.s} can't come "
         "in {a.r}, the home delivery service can bring books to {a.o} every three weeks."),
    ])
    return [(r, c.f(t, a=a)) for r, t in m]


def chat_lost(c):
    b = c.person()
    m = [("user", c.pick([
        "I think I left my {item} in the reading room yesterday. Has anyone handed one in?",
        "Hello, did anyone find a {item} near the study tables on {day}?",
    ])), ("assistant", c.pick([
        "We have two at the desk. A {b.gent} came in this morning and said the grey one was "
        "{b.pp}, so the other one may be yours.",
        "There's one in the lost property box. {b.name} on the early shift thought it was "
        "{b.pp} at first, but {b.s} found {b.p} own in {b.p} coat pocket.",
    ]))]
    if c.chance(0.5):
        m.append(("user", "That must be mine. Please thank {b.o} for me!"))
    return [(r, c.f(t, b=b)) for r, t in m]


def chat_history(c):
    a = c.person(kin=[("grandmother", "grandfather")])
    b = c.person()
    m = qa(c, [
        ("I'm researching my great-{a.kin}, who worked as {a.a_job} in town in the 1950s. "
         "Where should I start?",
         "The local history room keeps trade directories and electoral rolls. Ask for "
         "{b.formal}; {b.s} knows the collection well and can help you find where {a.s} "
         "lived and worked."),
        ("My great-{a.kin} ran a shop on the high street. Do you hold anything about {a.o} "
         "or {a.p} business?",
         "Start with the newspaper index: shop openings and adverts are all listed. {b.name} "
         "volunteers there on {day}s and {b.s} helped another family trace their "
         "great-{a.kin}'s shop only last month."),
    ])
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_volunteer(c):
    a = c.person(kin=KIN_YOUNG)
    b = c.person()
    m = qa(c, [
        ("My {a.kin} {a.name} is sixteen and wants to volunteer at the library. Is {a.s} old "
         "enough?",
         "Yes, from sixteen with a consent form. {a.name} can pick one up at the desk, and "
         "{b.full}, our volunteer coordinator, will give {a.o} a short induction."),
        ("{a.name}, my {a.kin}, asked whether {a.s} could help at the summer reading "
         "challenge. How does {a.s} apply?",
         "We'd love to have {a.o}. {b.full} coordinates the volunteers; {b.s} will phone "
         "{a.name} to arrange a chat and show {a.o} round."),
    ])
    if c.chance(0.5):
        m.append(("user", "Thank you. {a.name} said {a.s} would rather apply {a.r}, so I'll "
                          "pass this on to {a.o}."))
        m.append(("assistant", "That's the best way. Good luck to {a.o}!"))
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_bookclub(c):
    a = c.person(kin=KIN_ADULT)
    b = c.person(job=JOBS)
    m = qa(c, [
        ("Is the book club still meeting on {day}s? My {a.kin} read the memoir you chose and "
         "wants to discuss it.",
         "It is. This month it's the memoir of a retired {b.job} who spent {b.p} career in "
         "the valley. {a.S} would be very welcome, and nobody minds if {a.s} hasn't "
         "finished."),
        ("What is the evening book club reading next? My {a.kin} wants to join but {a.s} is "
         "a slow reader.",
         "Next up is a novel about {b.a_job} who moves to the coast to start {b.p} life "
         "again. Tell {a.o} the group reads one book every six weeks, so there's time."),
    ])
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_join_ride(c):
    a = c.person(kin=KIN_OLD)
    b = c.person()
    m = qa(c, [
        ("My {a.kin} is {old} and wants to join your Sunday ride. Is {a.s} too old?",
         "Not at all. Our oldest regular is {b.name}, who is 81 and still rides {b.p} own "
         "bike to the start. {a.S} can try two rides before paying the membership."),
        ("Hello, my {a.kin} has just retired and would love to ride with the club. Does "
         "{a.s} need a road bike?",
         "Any bike in good order will do. The social ride goes at about 18 km/h and "
         "{b.name}, who leads it, makes sure nobody is left behind. Tell {a.o} to bring a "
         "spare tube."),
    ])
    if c.chance(0.5):
        m.append(("user", "Great. Does {a.s} need to book?"))
        m.append(("assistant", "No booking. {a.S} should just turn up at the library car park "
                               "at {time} and introduce {a.r} to {b.name}."))
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_clinic(c):
    b = c.person(female_weight=0.7)
    m = [("user", c.pick([
        "My gears keep slipping on the hills. Is there anyone at the club who can look at "
        "them?",
        "My back brake squeals terribly. Does the club have a maintenance session?",
    ])), ("assistant", c.pick([
        "Yes, {b.name} runs the maintenance clinic on {day} evenings. {b.S} trained as a "
        "mechanic and rebuilt most of the club's hire bikes {b.r}. Bring the bike and "
        "{b.s}'ll sort it.",
        "The clinic is in the library garage from {time}. {b.full} is our best mechanic; "
        "{b.s} will probably show you how to fix it so you can do it yourself next time.",
    ]))]
    if c.chance(0.6):
        m += c.pick([
            [("user", "Thanks! Is there a charge, or should I bring {b.o} a cake?"),
             ("assistant", "It's free for members. {b.S} never says no to cake, though.")],
            [("user", "Brilliant. Is it all right if I watch while {b.s} works on it?"),
             ("assistant", "{b.S}'d prefer it. The whole point is that you learn to do it "
                           "without {b.o}.")],
        ])
    return [(r, c.f(t, b=b)) for r, t in m]


def chat_womens_ride(c):
    a = c.person(g="f", kin=KIN_ADULT)
    b = c.person(g="f")
    m = qa(c, [
        ("Is the women's ride on {day} okay for a complete beginner? I haven't ridden since "
         "I was a girl.",
         "Yes, it goes at a chatty pace and stops at {cafe}. {b.name} leads it; {b.s} waits "
         "at every junction and carries a pump for everyone."),
        ("I've seen posters for a ladies' ride. Is it really just for women, and how fast "
         "does it go?",
         "It's a women-only social ride of about 30 km at 16 km/h. {b.full} started it two "
         "years ago because {b.s} wanted a relaxed group; {b.p} rule is that nobody is "
         "dropped."),
    ])
    if c.chance(0.6):
        m.append(("user", "Could my {a.kin} come too? {a.S} is nervous about traffic."))
        m.append(("assistant", "Of course. The route avoids main roads, and {b.name} can ride "
                               "beside {a.o} for the first few miles if {a.s} likes."))
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_youth(c):
    a = c.person(kin=KIN_YOUNG)
    m = qa(c, [
        ("My {a.kin} is {teen} and {a.p} best friend wants to come too. Can they try the "
         "{a.youngs}' track session?",
         "Yes. The girls' and boys' sessions run side by side on {day} afternoons, and we "
         "lend helmets. {a.S} and {a.p} friend just need signed forms from a parent."),
        ("Does the club run anything for children? My {a.kin} has outgrown {a.p} first bike "
         "and now wants to race.",
         "The youth section meets on {day}s at {time}. The coaches will check {a.p} new bike "
         "at the start and pair {a.o} with someone of a similar age."),
    ])
    return [(r, c.f(t, a=a)) for r, t in m]


def chat_helmet(c):
    b = c.person()
    d = c.person()
    found_two = c.chance(0.5)
    m = [("user", "Did anyone hand in a helmet after {day}'s ride?")]
    if found_two:
        m.append(("assistant", "Two were left at {cafe}. {b.name} says the red one is "
                               "{b.pp}, so the black one may be yours."))
        if c.chance(0.7):
            m.append(("user", "The black one is mine, thanks! Please thank {b.o} for "
                              "checking."))
    else:
        m.append(("assistant", "One was found by {b.name} in the car park. {b.S} checked with "
                               "{d.name}, but the helmet isn't {d.pp} either, so it may well "
                               "be yours."))
        if c.chance(0.7):
            m.append(("user", "If it's black with a blue visor, it's mine. Please thank {b.o} "
                              "for me."))
            if c.chance(0.5):
                m.append(("assistant", "It is! {b.S}'ll bring it to the next ride for you."))
    return [(r, c.f(t, b=b, d=d)) for r, t in m]


def chat_kit(c):
    b = c.person()
    m = [("user", c.pick([
        "Do the new club jerseys come in a female cut?",
        "Are the club jerseys unisex, or are there male and female sizes?",
    ])), ("assistant", c.pick([
        "They come in male and female cuts, sizes XS to 3XL. {b.formal}, the kit secretary, "
        "has samples; ask {b.o} at the Sunday start.",
        "Both cuts are available. {b.name} is taking orders until the end of {month}, so "
        "e-mail {b.o} your size and {b.s}'ll add you to the list.",
    ]))]
    return [(r, c.f(t, b=b)) for r, t in m]


def chat_thanks_leader(c):
    a = c.person(kin=KIN_ADULT)
    b = c.person()
    m = [("user", c.pick([
        "I'd like to thank whoever led {route} on {day}. My {a.kin} had a puncture and the "
        "leader stayed with {a.o} until it was fixed.",
        "Please pass on our thanks to the ride leader: my {a.kin} was exhausted on the last "
        "hill and the leader rode the rest of the way with {a.o}.",
    ])), ("assistant", c.pick([
        "That was {b.name}. I'll pass your thanks to {b.o}; {b.s} will be really pleased.",
        "That would be {b.full}. {b.S} mentioned it, actually; {b.s} said your {a.kin} was "
        "in great spirits all the way home.",
    ]))]
    if c.chance(0.4):
        m.append(("user", "My {a.kin} thanked {b.o} at the time, but I wanted it on record "
                          "too."))
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_tandem(c):
    a = c.person(kin=KIN_ADULT)
    b = c.person()
    m = [("user", "My {a.kin} is visually impaired. Could {a.s} ride as a stoker on the club "
                  "tandem?"),
         ("assistant", c.pick([
             "Yes. {b.name} pilots the tandem most weekends and {b.s} is happy to take a new "
             "stoker. {a.S} should come to a short practice session first.",
             "Certainly. The tandem lives in the library garage, and {b.formal} captains it; "
             "{b.s} will walk {a.o} through starting and stopping before the ride.",
         ]))]
    return [(r, c.f(t, a=a, b=b)) for r, t in m]


def chat_committee(c):
    b = c.person()
    d = c.person()
    m = [("user", c.pick([
        "Who should I write to about the new route sign-up? Is there a chairman or a "
        "secretary?",
        "Who is the club's chairwoman now? I heard there was a change at the AGM.",
    ])), ("assistant", c.pick([
        "The {b.chair} is {b.formal}, who took over from {d.formal} in {month}. {d.formal} is "
        "still on the committee as treasurer.",
        "Write to {b.formal}, our {b.chair}. Letters left at the {branch} desk reach {b.o} "
        "within the week.",
    ]))]
    return [(r, c.f(t, b=b, d=d)) for r, t in m]


def chat_address(c):
    a = c.person()
    k = c.pick(["husband", "wife", "son", "daughter", "brother", "sister"])
    pro = "He" if k in ("husband", "son", "brother") else "She"
    m = [("user", c.pick([
        "Hello, this is {a.formal} from {branch}. Is this the right desk for the cycling "
        "club's bike library?",
        "Good morning, it's {a.formal}. I booked a hire bike for {day}.",
    ])), ("assistant", c.pick([
        "Good morning, {a.addr}. How can I help with the bike library today?",
        "Hello, {a.formal}. I have your booking here, {a.addr}: the blue hybrid, collected "
        "from the garage at {time}.",
    ]))]
    if c.chance(0.5):
        m.append(("user", "Thank you. My {k} may collect it for me if I'm late."))
        m.append(("assistant", "That's fine, {a.addr}. {K} just needs to give your name."))
    return [(r, c.f(t, a=a, k=k, K=pro)) for r, t in m]


GENDERED_CHATS = [
    (chat_renew, 8), (chat_knitting, 8), (chat_digital, 7), (chat_storytime, 6),
    (chat_access, 5), (chat_lost, 6), (chat_history, 5), (chat_volunteer, 6),
    (chat_bookclub, 5), (chat_join_ride, 7), (chat_clinic, 8), (chat_womens_ride, 6),
    (chat_youth, 5), (chat_helmet, 6), (chat_kit, 4), (chat_thanks_leader, 6),
    (chat_tandem, 4), (chat_committee, 5), (chat_address, 5),
]

# --------------------------------------------------------------------------------------
# Notices with gendered mentions. Each returns one string.
# --------------------------------------------------------------------------------------


def notice_thanks(c):
    a = c.person()
    deed = c.pick([
        "gave up {a.p} Saturday to re-shelve the whole children's section",
        "repaired eleven hire bikes in {a.p} own garage",
        "baked for the book sale and then ran the till {a.r}",
        "marshalled the junction at Fenn Hill for three hours in the rain",
        "wrote the new welcome leaflet for the help desk",
        "drove the club van to the time trial and back",
    ])
    more = c.pick([
        "We could not have done it without {a.o}.",
        "If you see {a.o} at the desk, please say thank you.",
        "{a.S} says the best part was the conversations along the way.",
        "{a.P} next project is the reading garden.",
        "We thanked {a.o} with a card signed by everyone on the rota.",
    ])
    return c.f("Thank you to {a.full}, who " + deed + ". " + more, a=a)


def notice_ride_report(c):
    a = c.person()
    b = c.person()
    t = c.pick([
        "{a.name} led {n} riders on {route} on {day}. {a.S} kept the pace steady, and "
        "{b.name} swept at the back, fixing two punctures on the way. Coffee at {cafe} was "
        "on {b.o}.",
        "Ride report: {route}, {km} km. {a.full} planned the route and {b.name} led it; "
        "{b.s} waited at the top of every climb. {a.name} says {a.s}'ll post the map online.",
        "{n} of us rode {route} with {a.name} in charge. Halfway round, {b.name} dropped "
        "{b.p} chain and {a.name} fixed it for {b.o} in two minutes flat.",
        "{a.name}'s first ride as leader went well: {n} riders, {km} km, no mishaps. We "
        "thanked {a.o} over tea at {cafe}, and {b.name} has promised to lead next week {b.r}.",
    ])
    return c.f(t, a=a, b=b)


def notice_committee(c):
    a = c.person()
    chair = "chairwoman" if a.g == "f" else "chairman"
    spokes = "spokeswoman" if a.g == "f" else "spokesman"
    t = c.pick([
        "The club has a new " + chair + ": {a.formal} was elected at the AGM. {a.S} says "
        "{a.p} first job is a safer meeting point.",
        "Our " + spokes + ", {a.formal}, told the local paper that the towpath closure would "
        "affect forty riders a week. {a.S} has asked the council for a diversion.",
        "Committee news: {a.full} steps down as " + chair + " after six years. {a.S} will "
        "stay on as a ride leader, and we thank {a.o} warmly.",
    ])
    return c.f(t, a=a)


def notice_speaker(c):
    a = c.person(job=JOBS)
    t = c.pick([
        "On {day} at {time} the library welcomes {a.full}, a retired {a.job}, who will speak "
        "about {a.p} years in the valley. {a.S} will sign copies of {a.p} book afterwards.",
        "Author visit: {a.formal}, a former {a.job}, reads from {a.p} new memoir at "
        "{branch} on {day}. Tickets are free; ask {a.o} anything in the question session.",
    ])
    return c.f(t, a=a)


def notice_family(c):
    a = c.person()
    b = c.person(kin=KIN_ADULT + KIN_YOUNG)
    t = c.pick([
        "Congratulations to {a.name} and {a.p} {b.kin} {b.name}, who rode the {km} km charity "
        "ride together and raised money for the children's ward.",
        "{a.name} brought {a.p} {b.kin} on the family ride this {day}. {b.S} did the whole "
        "loop and says {b.s} wants to come every week.",
        "Welcome to {b.name}, whose {k} has ridden with us for years. {b.S} joined on {day} "
        "and already has {b.p} own club jersey.",
    ])
    k = c.pick(["mother", "father", "grandmother", "grandfather", "aunt", "uncle"])
    return c.f(t, a=a, b=b, k=k)


def notice_groups(c):
    a = c.person()
    b = c.person(female_weight=0.6)
    t = c.pick([
        "The women's maintenance class is full this term, but the men's beginners' group "
        "still has places. {a.name} teaches both.",
        "New this {month}: a gentle ride for new mothers and fathers with trailers and child "
        "seats. {b.name} leads it; {b.s} has a toddler {b.r}.",
        "The boys' and girls' reading challenge starts in {month}. Last year {a.name} read "
        "forty books and {a.p} {k} read them all to {a.o} at bedtime.",
        "Our knitting circle now has six men and nine women. {b.name}, who started it, says "
        "{b.s} would love a few more beginners.",
        "Ladies and gentlemen, the AGM starts at {time} in the upstairs room. {b.full} will "
        "chair it, and {b.s} asks that motions reach {b.o} by {day}.",
    ])
    k = c.pick(["grandmother", "grandfather", "mother", "father", "stepmother", "stepfather"])
    return c.f(t, a=a, b=b, k=k)


def notice_found(c):
    a = c.person()
    t = c.pick([
        "Found after the {day} ride: a blue pump. {a.name} thinks it is {a.pp}; if it's "
        "yours instead, tell the desk before {a.s} takes it home.",
        "Lost property: the {item} left in the reading room belongs to {a.formal}. It is "
        "{a.pp}, so please don't take it by mistake.",
        "The helmet on the shelf by the door is {a.pp}: {a.name} will collect it on {day}.",
        "A {a.noun} walking {a.p} dog found a set of bike lights on the towpath and handed "
        "them in at {branch}. {a.S} would not leave {a.p} name.",
    ])
    return c.f(t, a=a)


def notice_cafe(c):
    b = c.person()
    job = "waitress" if b.g == "f" else "waiter"
    t = c.pick([
        "Thanks to the staff at {cafe}, and especially to {b.name}, the " + job + " who kept "
        "the tea coming while we sheltered from the hail. {b.S} even dried our gloves.",
        "Our coffee stop at {cafe} has a new " + job + ", {b.name}, who used to ride with the "
        "club. {b.S} says members get a free refill.",
    ])
    return c.f(t, b=b)


def notice_tribute(c):
    a = c.person()
    t = c.pick([
        "We remember {a.full}, who founded the Sunday social ride. {a.S} believed everyone "
        "should have someone to ride with, and {a.p} bell still hangs in the garage.",
        "{a.full} has retired from the help desk after twenty years. {a.S} has shown "
        "thousands of people how to find a book, and we will miss {a.o}.",
    ])
    return c.f(t, a=a)


def notice_mechanics(c):
    a = c.person(g="f")
    b = c.person(g="m")
    t = c.pick([
        "The {day} repair stand will be staffed by {a.name} and {b.name}. {a.S} handles "
        "wheels and brakes; {b.s} does gears and will also show you how to oil a chain.",
        "{a.formal} is our new lead mechanic. {a.P} workshop tips are pinned by the garage "
        "door, and {b.name} has offered to be {a.p} assistant on {day}s.",
    ])
    return c.f(t, a=a, b=b)


GENDERED_NOTICES = [
    (notice_thanks, 11), (notice_ride_report, 11), (notice_committee, 7),
    (notice_speaker, 7), (notice_family, 9), (notice_groups, 9), (notice_found, 6),
    (notice_cafe, 5), (notice_tribute, 4), (notice_mechanics, 6),
]

# --------------------------------------------------------------------------------------
# Records with no gendered mention (no gendered words, no first names).
# --------------------------------------------------------------------------------------

NEUTRAL_NOTICES = [
    "{branch} branch opening hours from {month}: Monday to Friday 9:00 to 19:00, Saturday "
    "9:00 to 13:00, closed on Sundays.",
    "The {branch} branch will be closed on {day} for floor repairs. Returns can go in the "
    "book drop by the side door.",
    "Tyre tip: before fitting a new tube, run your fingers carefully round the inside of the "
    "tyre to find the thorn or glass that caused the puncture.",
    "Tyre tip: pump road tyres to the pressure printed on the sidewall, and check it every "
    "week; most slow punctures start as under-inflation.",
    "Chain care: wipe the chain with a dry rag after a wet ride, then add one drop of oil "
    "per link and wipe off the excess.",
    "Brake check: if the lever touches the handlebar when squeezed, the cable needs "
    "tightening before the next ride.",
    "Evening rides from {month} need front and rear lights. Spare lights can be borrowed "
    "from the {branch} desk.",
    "Printing costs 10p per black-and-white page and 40p per colour page. Pay at the desk "
    "or with the card reader by the printer.",
    "Free Wi-Fi is available in every branch. Ask at the desk for the current access code.",
    "The community room at {branch} can be booked for meetings of up to thirty people. "
    "Bookings open four weeks in advance.",
    "Road closure: the bridge on {route} is shut until the end of {month}. Rides will use "
    "the diversion through the industrial estate.",
    "If the forecast shows ice or winds above 40 mph, the {day} ride is cancelled. Check the "
    "club noticeboard by 8:00.",
    "Ride grades: A rides average 28 km/h, B rides 24 km/h and social rides about 18 km/h. "
    "All rides stop for coffee.",
    "The {day} ride meets at {time} in the library car park and leaves five minutes later. "
    "Bring a spare tube and a snack.",
    "The library's e-book app has been updated. If your loans have disappeared, sign out "
    "and sign in again.",
    "The annual book sale runs all week at {branch}: paperbacks 50p, hardbacks 1 pound, all "
    "proceeds to the children's reading fund.",
    "The bike library now has twelve hybrids, two tandems and a cargo bike. Members may "
    "borrow one for up to a week.",
    "Puncture kits, tyre levers and a track pump are kept in the locker by the garage door. "
    "Please return them after use.",
    "Saddle height tip: with the pedal at its lowest point, your knee should be slightly "
    "bent, not locked straight.",
    "The reading garden is open from 10:00 to 16:00 in dry weather. Please leave the gate "
    "closed behind you.",
    "Spare inner tubes in 700x28 and 26-inch sizes are for sale at the desk at cost price.",
    "Overdue reminders are now sent by e-mail. Update your contact details at the desk or "
    "online.",
    "Helmets are compulsory on all club rides, and gloves are strongly recommended in "
    "winter.",
]

NEUTRAL_CHATS = [
    [("user", "What time does the {branch} branch open on Saturdays?"),
     ("assistant", "Nine o'clock until one. The book drop is open all weekend.")],
    [("user", "How do I fix a slow puncture?"),
     ("assistant", "Take the tube out, pump it up and listen for the hiss, or hold it under "
                   "water and look for bubbles. Patch it, then check the tyre for the cause "
                   "before you refit it.")],
    [("user", "Can I print from my phone?"),
     ("assistant", "Yes. Send the file to the print address on the sign by the printer, then "
                   "release it at the machine with your library card."),
     ("user", "Thanks, that worked first time.")],
    [("user", "Is the {day} ride still on if it rains?"),
     ("assistant", "Light rain, yes. Heavy rain or ice, no: the ride leader posts a decision "
                   "on the noticeboard by 8:00.")],
    [("user", "Do I need lights for the evening ride?"),
     ("assistant", "Yes, front and rear, from {month} onwards. You can borrow a set from the "
                   "desk if yours are flat.")],
    [("user", "How many books can I borrow at once?"),
     ("assistant", "Up to fifteen items on an adult card, for three weeks each."),
     ("user", "And can I renew online?"),
     ("assistant", "Yes, twice per item, unless someone else has reserved it.")],
    [("user", "What tyre pressure should I use on the towpath?"),
     ("assistant", "A little lower than on the road helps on gravel: try 10 to 15 psi below "
                   "the maximum printed on the tyre.")],
    [("user", "Where does the {day} ride start?"),
     ("assistant", "In the library car park at {time}. Look for the club flag by the bike "
                   "racks.")],
    [("user", "Can I join the library if I don't live in the county?"),
     ("assistant", "Yes, anyone who works or studies locally can join. Bring proof of address "
                   "or a letter from your employer.")],
    [("user", "My chain keeps coming off. Any idea why?"),
     ("assistant", "Usually the rear derailleur needs adjusting, or the chain is worn. The "
                   "repair stand on {day} can check both in a few minutes."),
     ("user", "I'll bring it along, thanks.")],
    [("user", "Do you sell maps of the local cycle routes?"),
     ("assistant", "The desk has free leaflets for five waymarked routes, and the club posts "
                   "GPS files for every ride.")],
    [("user", "Is there somewhere to lock a bike at {branch}?"),
     ("assistant", "There are covered racks for twenty bikes next to the entrance, watched by "
                   "a camera.")],
    [("user", "How much is club membership?"),
     ("assistant", "Twenty pounds a year, or ten for students and anyone under eighteen. It "
                   "includes insurance on club rides."),
     ("user", "Can I pay at the library desk?"),
     ("assistant", "Yes, by card or cash.")],
    [("user", "Can I reserve a book that's out on loan?"),
     ("assistant", "Yes, reservations are free. You'll get an e-mail when it's ready to "
                   "collect.")],
    [("user", "What should I carry on a 60 km ride?"),
     ("assistant", "A spare tube, tyre levers, a mini pump, water, a snack and a rain "
                   "jacket. A phone and a little cash are sensible too.")],
]

# --------------------------------------------------------------------------------------
# Hard cases: each kind appears in a handful of records. Every entry is either a string
# (a notice) or a list of (role, content) pairs (a chat). Templates may use {a.*} (a
# random person) and the usual slots.
# --------------------------------------------------------------------------------------

HARD = {
    "url-email-handle": [
        "Details of the family craft table are at https://example.org/mothers-day and the "
        "sign-up sheet is at https://example.org/signup?group=women.",
        "{a.name} will run the craft table this year (see https://example.org/mothers-day); "
        "{a.s} says all ages are welcome.",
        [("user", "Where do I send photos from the ladies' ride?"),
         ("assistant", "E-mail them to mrs.ashworth@example.org, or post them with the tag "
                       "@queenofspokes. She shares the best ones every Monday.")],
        "On the volunteer form, replace the placeholder his.name@example.net with your own "
        "address before you press send.",
        [("user", "Who runs the @kingofthehill_rides account?"),
         ("assistant", "{a.full} does. {a.S} posts the hill-climb results there and at "
                       "https://example.net/club/his-and-hers-tandem-results.")],
        "Follow @queenofspokes for route updates: the leader of the women's ride posts the "
        "map the night before.",
    ],
    "inline-code": [
        "To list only biographies of women, type `subject:women biography` in the catalogue "
        "search box.",
        [("user", "The kiosk asks for a command. What do I type to renew my mother's books?"),
         ("assistant", "Type `RENEW --card` followed by her card number, then press Enter. "
                       "Her PIN goes in the second box.")],
        "In the volunteer spreadsheet the column is called `his_or_her_name`; please leave "
        "the heading as it is and fill in {a.name}'s row.",
        "The guest Wi-Fi password changed to `Mother-Goose-42`. Ask {a.formal} if {a.s} is "
        "on the desk.",
    ],
    "all-caps": [
        "NOTICE: THE LADIES' AND MEN'S CHANGING ROOMS ARE CLOSED FOR REPAIRS UNTIL {day}.",
        "URGENT: A BIKE WAS LEFT UNLOCKED OUTSIDE. IF IT IS HIS, PLEASE TELL MR {A_SURNAME} "
        "AT THE DESK.",
        [("user", "Is {a.name} leading on Sunday?"),
         ("assistant", "No: SHE is on holiday. Her brother leads instead, and HE has moved the "
                       "start to {time}.")],
        "Please tell him the ride is CANCELLED. SHE WHO ARRIVES FIRST UNLOCKS THE GARAGE, as "
        "{a.name}'s sign says.",
    ],
    "sentence-initial": [
        "Her bike is the green one by the door. His is the tandem, and the helmet on the hook "
        "is his too. Hers was repaired on {day}; his still needs a new chain.",
        "She said the route was too hilly. He said it was perfect. They both finished it.",
        "Hannah said she would lead the Sunday ride herself. Michael said he would sweep, "
        "and Emily thanked them both.",
        [("user", "Mother says the book is overdue."),
         ("assistant", "Her loan was renewed yesterday, so it's fine. Father's card is "
                       "clear too.")],
        "Himself a keen rider, the new chairman thanked the businesswoman who sponsors the "
        "youth section and gave her the club's first trophy.",
    ],
    "medical": [
        "{a.name} is pregnant and has stepped back from the fast rides until after the baby "
        "arrives; {a.s} will still marshal at the time trial. Congratulations to her!",
        [("user", "My wife is pregnant. Is it safe for her to keep riding the Sunday social "
                  "ride?"),
         ("assistant", "Many riders do, but please ask her midwife first. The social ride is "
                       "gentle, and she can turn back at any point.")],
        "Reminder for men over 50: the free prostate check-up clinic at the health centre "
        "runs on {day}. {b.name} went last year and says it took ten minutes.",
        "{a.name} is on maternity leave from the help desk; {a.p} daughter was born on "
        "{day}. Cards can be left for her at the desk.",
        [("user", "My father is due a prostate check-up and wants to know if he can still "
                  "ride this week."),
         ("assistant", "That is a question for his doctor, but he is welcome back on the "
                       "social ride as soon as he feels ready.")],
    ],
    "non-ascii": [
        "Thanks to Zoë and José for running the café stall ☕ at the book sale. She baked "
        "and he did the till.",
        [("user", "Is Zoë’s repair class on tonight? 🚲"),
         ("assistant", "Yes! She starts at 18:30 in the garage — bring your bike and "
                       "her spare-parts list.")],
        "Renée rode her first 100 km on {day} 🎉 and her grandmère waved from the café.",
        "Chloé has been named ride leader of the month. Félicitations to her — and to her "
        "co-leader, Søren, who swept every ride himself. 📚🚴",
    ],
    "apostrophes": [
        "The women’s ride and the men's ride meet together at {cafe}. Her mother’s flask and "
        "his father's pump were both left on the table.",
        "Lost after the youth session: a boys’ helmet and a girls' bike lock. {a.name}’s "
        "mother's car was the last to leave, so please ask her first.",
        [("user", "Is my mother’s library card still valid? She wants to borrow a bike too."),
         ("assistant", "Yes, your mother's card runs until {month}, and her bike library "
                       "membership is on the same card.")],
    ],
    "json-escapes": [
        "The old sign says \"Ladies, please leave your bikes by the gate\". {a.name} has "
        "asked for it to be changed to \"Please leave bikes by the gate\".",
        [("user", "Can you send me the route for Sunday?"),
         ("assistant", "Here it is:\n1. Meet at the library at {time}.\n2. {a.name} leads "
                       "to the reservoir; {a.s} will wait at the lights.\n3. Coffee at "
                       "{cafe}.")],
        "Volunteer rota\tRole\nMary Carter\tchairwoman\nJohn Pike\tride leader\nHer deputy\t"
        "to be confirmed",
        [("user", "Where is the rides file?"),
         ("assistant", "On the desk computer at C:\\club\\rides\\his-and-hers.csv. Ask "
                       "{a.name} if {a.s} can't find it.")],
    ],
}


def record_json(rec, ascii_only=False):
    return json.dumps(rec, ensure_ascii=ascii_only, separators=(", ", ": "))


# --------------------------------------------------------------------------------------
# helpdesk.jsonl
# --------------------------------------------------------------------------------------


def chat_record(pairs):
    return {"channel": "chat", "messages": [{"role": r, "content": t} for r, t in pairs]}


def notice_record(text):
    return {"channel": "notice", "text": text}


def build_helpdesk(rng):
    items = []  # (kind, record without id)
    seen = set()

    def add(kind, rec):
        key = json.dumps(rec, sort_keys=True)
        if key in seen:
            return False
        seen.add(key)
        items.append((kind, rec))
        return True

    def curly_maybe(c, text):
        return typographic(text) if c.chance(0.2) else text

    for fn, count in GENDERED_CHATS:
        made = 0
        while made < count:
            c = Ctx(rng)
            pairs = fn(c)
            pairs = [(r, curly_maybe(c, t)) if c.chance(0.5) else (r, t) for r, t in pairs]
            made += add("gendered", chat_record(pairs))
    for fn, count in GENDERED_NOTICES:
        made = 0
        while made < count:
            c = Ctx(rng)
            made += add("gendered", notice_record(curly_maybe(c, fn(c))))

    # Neutral: every template once, then more with fresh slot values until 75 in all.
    neutral_target = 75
    neutral = 0
    for t in NEUTRAL_NOTICES:
        neutral += add("neutral", notice_record(Ctx(rng).f(t)))
    for pairs in NEUTRAL_CHATS:
        c = Ctx(rng)
        neutral += add("neutral", chat_record([(r, c.f(t)) for r, t in pairs]))
    while neutral < neutral_target:
        c = Ctx(rng)
        if c.chance(0.5):
            rec = notice_record(c.f(c.pick(NEUTRAL_NOTICES)))
        else:
            rec = chat_record([(r, c.f(t)) for r, t in c.pick(NEUTRAL_CHATS)])
        neutral += add("neutral", rec)

    for kind, entries in HARD.items():
        for e in entries:
            c = Ctx(rng)
            a = c.person()
            b = c.person()
            fill = lambda t: t.format(**c.slots, a=a, b=b, A_SURNAME=a.surname.upper())
            if isinstance(e, str):
                rec = notice_record(fill(e))
            else:
                rec = chat_record([(r, fill(t)) for r, t in e])
            add("hard:" + kind, rec)

    # One record whose selected field is a number, not a string.
    add("hard:number-field", {"channel": "chat", "messages": [
        {"role": "user", "content": "How many places are left on Saturday's women's beginner "
                                    "ride? My niece wants to book hers."},
        {"role": "assistant", "content": 6},
        {"role": "user", "content": "Thanks, she'll book tonight."},
    ]})

    # Fill up to the target with more gendered records, alternating shapes.
    chat_fns = [fn for fn, _ in GENDERED_CHATS]
    notice_fns = [fn for fn, _ in GENDERED_NOTICES]
    ascii_escaped = 2  # records written with \u escapes for every non-ASCII character
    while len(items) < HELPDESK_RECORDS - ascii_escaped:
        c = Ctx(rng)
        if c.chance(0.55):
            add("gendered", chat_record(c.pick(chat_fns)(c)))
        else:
            add("gendered", notice_record(curly_maybe(c, c.pick(notice_fns)(c))))

    # Two records spelled with JSON \u escapes (a two-byte letter and a surrogate pair).
    items.append(("hard:unicode-escapes", notice_record(
        "Zoë and her mother led the family ride 🚲 and thanked James for sweeping. He says "
        "it’s his turn to lead next time.")))
    items.append(("hard:unicode-escapes", chat_record([
        ("user", "Is Zoë’s father bringing the club tandem?"),
        ("assistant", "Yes — he says it’s his turn. 🙂")])))

    rng.shuffle(items)
    lines, kinds = [], []
    for i, (kind, rec) in enumerate(items, 1):
        full = {"id": f"hd-{i:04d}"}
        full.update(rec)
        lines.append(record_json(full, ascii_only=(kind == "hard:unicode-escapes")))
        kinds.append(kind)
    return lines, kinds


# --------------------------------------------------------------------------------------
# club-notes.txt: one document per line
# --------------------------------------------------------------------------------------

# Club-note templates. People: a and b (either gender), w (a woman), m (a man), k (a
# relative of a, either gender).
NOTE_TEMPLATES = [
    "{a.name} led {route} on {day} with {n} riders. {a.S} stopped at every junction, and "
    "{b.name} swept, helping a newcomer fix {b.p} own first puncture.",
    "Thanks to {a.full} for marshalling the time trial. {a.S} stood at the turn for four "
    "hours and still cheered every rider home.",
    "Big thanks to {b.name}, who drove the van to the reservoir and back. The spare wheels "
    "in it were {b.pp}, and {b.s} lent them to three riders.",
    "{a.name} and {a.p} {k.kin} {k.name} did their first club ride together. {k.name} "
    "says the last hill nearly beat {k.o}, but {a.name} waited at the top.",
    "Ride report: {km} km on {route}. {a.name} planned it, {b.name} led it, and both of "
    "them thanked the {k.server} at {cafe} for opening early.",
    "Welcome back to {a.formal}, who has returned after a year off. {a.S} rode {a.p} old "
    "steel bike and kept up with the fast group.",
    "The women's ride had its biggest turnout yet: {n} riders. {w.name} led; {w.p} route "
    "avoided every main road, and {w.s} has already planned the next one.",
    "The men's beginners' group is going well. {m.name} joined in {month} and now rides "
    "{km} km without stopping; {m.s} credits {b.name}'s patience.",
    "Youth section: the girls' and boys' relay was won by a mixed team. {a.name}, the "
    "coach, says {a.s} was proud of all of them.",
    "{b.name} rebuilt the club tandem {b.r} over the winter. We thanked {b.o} with a new "
    "set of tools, which are now {b.pp} to keep.",
    "{a.full}, our {a.chair}, and {b.full}, our treasurer, will both stand again at the "
    "AGM. Nominations to either of them by {day}.",
    "Our {b.spokes}, {b.formal}, spoke to the council about the towpath. {b.S} says the "
    "repairs should finish by {month}.",
    "{a.name}'s mother-in-law, who is {old}, rode the social loop and asked when the next "
    "one is. {a.name} has promised to bring her again.",
    "The gentleman who found a phone at {cafe} handed it to {a.name}; {a.s} returned it to "
    "its owner the same evening.",
    "Congratulations to {a.name}, who passed {a.p} ride leader course. {a.S} will lead the "
    "{day} social ride from {month}.",
    "{b.name}'s stepfather came to watch the hill climb and ended up timing it. We thanked "
    "him with a club mug and a slice of cake.",
    "The ladies who run the {branch} book sale lent us their tables for the bike jumble. "
    "{m.name} carried them back {m.r}.",
    "{a.name} asked whether the lost gloves were {b.name}'s. They are not {b.pp}, so they "
    "are still on the shelf by the door.",
    "Thanks to {b.name}'s grandson for the photos of {route}. He climbed a wall to get the "
    "best one.",
    "A female rider new to the area asked about routes; {a.name} gave her a map and rode "
    "the first loop with her.",
    "{a.name}, a retired {a.police}, now runs the bike-marking session. {a.S} engraves "
    "postcodes on frames and gives advice on locks.",
    "{b.name}'s niece and nephew rode the family loop on a tandem. Their aunt followed on "
    "the cargo bike with the picnic.",
    "The club's {a.business} of the year award goes to {a.formal}, whose bike shop "
    "sponsors the youth section. {a.S} refuses to give a speech.",
    "Sir or madam, the club has no dress code: {a.name} rode in {a.p} gardening clothes and "
    "nobody minded.",
    "{w.name} won the hill climb for the third year running. {w.S} thanked {w.p} father, "
    "who still services {w.p} bike, and {m.name}, who paced {w.o} in training.",
    "{m.name} has taken over the Tuesday knitting-and-cycling evening from {w.name}. {m.S} "
    "says {m.p} first scarf is nearly long enough.",
    "The male voice choir rode to the summer fair with us this year; {a.name} made sure "
    "every singer had a helmet that fitted, and {a.s} brought spares from {a.p} own garage.",
    "{a.name} lent {a.p} pump to a boy whose tyre had gone flat by the river. His mother "
    "came to the garage later to say thank you.",
    "Thanks to {w.formal}, whose son and daughter marshalled the crossroads all morning. "
    "{w.S} brought flasks of soup for every volunteer.",
    "{k.name} rode {km} km on {k.p} {k.young}hood bike, which {a.name}, {k.p} {a.kin}, "
    "found in the loft and restored.",
    "{b.name} asked for the lost-property box: the reflective vest in it is {b.pp}. {b.S} "
    "left it at {cafe} on {day}.",
    "A lady waiting at the level crossing asked about joining; {m.name} gave her a leaflet, "
    "and she rode with us on {day}.",
    "Our oldest member, {a.formal}, turned ninety this {month}. {a.S} still rides to the "
    "library every week, and {a.p} granddaughter rode beside {a.o} on the birthday loop.",
]
NOTE_NEUTRAL = [
    "Route note: the gate at the top of {route} is now locked after dusk, so evening rides "
    "turn at the cattle grid.",
    "The club track pump has a new head; it fits both valve types without an adapter.",
    "Reminder: the {day} ride leaves at {time} sharp from the library car park.",
    "Gravel on the descent into the village after the storm: take it slowly and keep to the "
    "left.",
    "The garage key is now kept at the {branch} desk; sign it out and back in.",
    "{km} km, 600 m of climbing, one puncture and a very good scone at {cafe}.",
]


def note_line(c, template):
    a = c.person()
    b = c.person()
    w = c.person(g="f")
    m = c.person(g="m")
    k = c.person(kin=KIN_YOUNG)
    if "{a.kin}" in template:
        # a is k's parent, grandparent, aunt or uncle: pick a's word to match k's.
        old_for_young = {
            "daughter": ("mother", "father"), "son": ("mother", "father"),
            "granddaughter": ("grandmother", "grandfather"),
            "grandson": ("grandmother", "grandfather"),
            "niece": ("aunt", "uncle"), "nephew": ("aunt", "uncle"),
            "stepdaughter": ("stepmother", "stepfather"),
            "stepson": ("stepmother", "stepfather"),
        }[k.kin]
        a.kin = old_for_young[0 if a.g == "f" else 1]
    return c.f(template, a=a, b=b, w=w, m=m, k=k)


def build_notes(rng):
    """60 one-line documents: each template about twice, neutral notes spread through."""
    order = []
    while len(order) < CLUB_NOTES - len(NOTE_NEUTRAL) - 2:
        batch = list(range(len(NOTE_TEMPLATES)))
        rng.shuffle(batch)
        order += batch
    order = order[: CLUB_NOTES - len(NOTE_NEUTRAL) - 2]
    lines, kinds, seen = [], [], set()
    for i in order:
        while True:
            c = Ctx(rng)
            text = note_line(c, NOTE_TEMPLATES[i])
            if text not in seen:
                break
        seen.add(text)
        lines.append(typographic(text) if c.chance(0.15) else text)
        kinds.append("gendered")
    # Two fixed lines with non-ASCII text and both kinds of apostrophe.
    lines.append("Zoë led the women’s café ride in the rain and thanked her mother’s friend for the "
                 "spare jacket. 🚲")
    lines.append("Mary's boys' team won the relay; Hannah’s father's flask of tea came a "
                 "close second.")
    kinds += ["gendered", "gendered"]
    for t in NOTE_NEUTRAL:
        lines.append(Ctx(rng).f(t))
        kinds.append("neutral")
    both = list(zip(lines, kinds))
    rng.shuffle(both)
    return [x for x, _ in both], [y for _, y in both]


# --------------------------------------------------------------------------------------
# club-letters.txt: multi-line documents separated by one blank line
# --------------------------------------------------------------------------------------

CLUB = "Kestlebury Spokes Cycling Club"


def letter(c, kind, secretary):
    # the recipient or the person the letter is about (the shop owner is a woman here)
    a = c.person(g="f" if kind == "sponsor" else None)
    k = c.person(kin=KIN_YOUNG)  # a young relative of the recipient, or a member named
    a2 = c.person()  # a second adult: coach or referee
    sal = "Dear {a.formal},"
    close = "Yours sincerely,"
    sig = [secretary.full, "Secretary, " + CLUB]
    if kind == "thanks":
        close = "With warm thanks,"
        body = ["Thank you for the time you gave to the club this year. You led more rides "
                "than anyone else, and three new members told me they joined because of you.",
                "{k.name}, who rode with you on {route}, says you waited for {k.o} at the top "
                "of every hill. Your question at the AGM about husbands and wives riding "
                "together was a fair one too: partners are welcome on every social ride."]
    elif kind == "agm":
        sal = "Dear members, ladies and gentlemen,"
        body = ["The annual general meeting takes place on {day} at {time} in the upstairs "
                "room at {branch}. Our {a.chair}, {a.formal}, will present the year's "
                "report, and {a.s} would like motions to reach {a.o} a week before.",
                "Tea and cake will be provided by {k.name} and {k.p} father. Members who "
                "cannot attend may send a proxy; the form is at the library desk."]
    elif kind == "parent":
        body = ["Your {k.kin} {k.name} has been a real asset to the youth section. {k.S} is "
                "always on time, helps the younger riders with their helmets and has "
                "improved {k.p} sprint enormously.",
                "We would like to invite {k.o} to the regional training day in {month}, with "
                "your permission. Our coach, {a2.formal}, will drive the minibus and bring "
                "{k.o} home afterwards; {a2.s} can be reached through the library desk."]
        sig = [a2.full, "Youth coach, " + CLUB]
    elif kind == "welcome":
        close = "Best wishes,"
        body = ["Welcome to the Kestlebury Spokes. Your membership card is enclosed.",
                "The social ride leaves the library car park at {time} every {day}; ask for "
                "{k.name}, who is our welcome officer this season. {k.S} will introduce you "
                "to the group and lend you a map if you need one."]
    elif kind == "apology":
        sal = "Dear Sir or Madam,"
        body = ["I am sorry that the {day} ride on {route} was cancelled at short notice.",
                "Our leader, {a.full}, was taken ill that morning, and {a.s} asked me to pass "
                "on {a.p} apologies. {a.S} is much better now and will lead the rescheduled "
                "ride {a.r} next month."]
    elif kind == "library":
        body = ["The club would like to run a joint stand with the library at the summer "
                "fair. {k.name} from our committee has offered to bring the repair stand, and "
                "{k.s} will need a table near the entrance.",
                "Could you ask the branch manager whether she or he would be willing to "
                "discuss it? Either of us would be glad to call in at {branch}."]
    elif kind == "reference":
        sal = "To whom it may concern,"
        body = ["I have known {a.full} for six years as a volunteer at the library help desk "
                "and as a ride leader in the Kestlebury Spokes.",
                "{a.S} is reliable, calm with the public and good with money. {a.P} "
                "colleagues speak highly of {a.o}, and I recommend {a.o} without "
                "reservation."]
        sig = [a2.full, "Volunteer coordinator, Kestlebury Regional Library"]
    elif kind == "sponsor":
        body = ["As a local {a.business} and a keen rider yourself, you may be interested in "
                "sponsoring the youth section's new jerseys. Last year the boys' and girls' "
                "teams raced in borrowed kit.",
                "Your shop's name would appear on every sleeve, and {k.name}, our youth "
                "captain, would present the first jersey to you in person."]
    elif kind == "cafe":
        close = "With thanks,"
        body = ["On behalf of the club, thank you for opening {cafe} early for our {day} "
                "ride.",
                "Your {k.server}, {k.name}, served forty teas in twenty minutes and still "
                "found time to fill our bottles. Please pass our thanks to {k.o} and to the "
                "rest of your staff."]
    elif kind == "tribute":
        close = "With our deepest sympathy,"
        body = ["We were very sad to hear of your mother’s death. She rode with the club for "
                "thirty years, taught half the committee to mend a puncture and never once "
                "left anyone behind.",
                "We would like to plant a tree by the garage in her memory, if you and your "
                "family agree."]
    else:
        raise ValueError(kind)
    lines = [c.f(sal, a=a, k=k)]
    for para in body:
        lines += textwrap.wrap(c.f(para, a=a, k=k, a2=a2), width=78)
    lines += [close] + sig
    return "\n".join(lines)


LETTER_KINDS = ["thanks", "agm", "parent", "welcome", "apology", "library", "reference",
                "sponsor", "cafe", "tribute"]


def build_letters(rng):
    secretary = Ctx(rng).person()
    letters = []
    for kind in LETTER_KINDS:
        c = Ctx(rng)
        c.used += [secretary.name, secretary.surname]
        letters.append(letter(c, kind, secretary))
    return letters


# --------------------------------------------------------------------------------------
# Self-checks: the labels above must be true of the text, and the forms the demo is meant
# to exercise must all occur in helpdesk.jsonl.
# --------------------------------------------------------------------------------------

GENDERED_WORDS = set(
    "she he her him his hers herself himself mrs mr ms miss sir madam woman women man men "
    "girl girls boy boys lady ladies gentleman gentlemen female male wife husband mother "
    "father mothers fathers son daughter brother sister aunt uncle niece nephew grandson "
    "granddaughter grandmother grandfather stepmother stepfather stepson stepdaughter "
    "mother-in-law father-in-law chairwoman chairman spokeswoman spokesman waitress waiter "
    "actress actor policewoman policeman businesswoman businessman headmistress headmaster "
    "postwoman postman landlady landlord".split())
GENDERED_WORDS.update(n.lower() for n in FEMALE_NAMES + MALE_NAMES)

MUST_OCCUR = [
    "she", "he", "her", "him", "his", "hers", "herself", "himself", "She", "He", "Her", "His",
    "SHE", "HE", "mother", "father", "grandson", "niece", "aunt", "stepfather",
    "mother-in-law", "Mrs", "Mr", "sir", "madam", "chairwoman", "spokesman", "waitress",
    "actor", "policeman", "businesswoman", "woman", "men", "girls", "boys", "lady",
    "gentleman", "female", "male", "women's", "women\u2019s", "boys'", "mother's",
    "mother\u2019s", "Emily", "Olivia", "Hannah", "Mary", "James", "John", "Michael",
    "Daniel", "Thomas", "Zoë", "@queenofspokes", "https://example.org/mothers-day",
    "his.name@example.net", "`", "pregnant", "prostate", "\n", "\t", '"', "🚲",
    "is his", "is hers", "thanked her", "her bike",
]


def words(text):
    return re.findall(r"[A-Za-z]+(?:-[A-Za-z]+)*", text)


def strings_of(rec):
    if isinstance(rec.get("text"), str):
        yield rec["text"]
    for m in rec.get("messages", []):
        if isinstance(m.get("content"), str):
            yield m["content"]


def has_gendered(text):
    return any(w.lower() in GENDERED_WORDS for w in words(text))


def self_check(hd_lines, hd_kinds, notes, note_kinds, letters):
    problems = []
    everything = []
    for line, kind in zip(hd_lines, hd_kinds):
        rec = json.loads(line)
        texts = list(strings_of(rec))
        everything += texts
        g = any(has_gendered(t) for t in texts)
        if kind == "neutral" and g:
            problems.append(f"{rec['id']} is labelled neutral but has a gendered word")
        if kind == "gendered" and not g:
            problems.append(f"{rec['id']} is labelled gendered but has no gendered word")
        if rec["channel"] == "chat" and not 2 <= len(rec["messages"]) <= 4:
            problems.append(f"{rec['id']} has {len(rec['messages'])} messages, not 2 to 4")
    for text, kind in zip(notes, note_kinds):
        if (kind == "neutral") == has_gendered(text):
            problems.append(f"club note mislabelled: {text[:40]}")
    for form in MUST_OCCUR:
        bounded = re.compile(r"(?<![\w@.])" + re.escape(form) + r"(?![\w])")
        if form[0].isalpha() and form[-1].isalpha() or form.endswith("'"):
            found = any(bounded.search(t) for t in everything)
        else:
            found = any(form in t for t in everything)
        if not found:
            problems.append(f"form never occurs: {form!r}")
    return problems


# --------------------------------------------------------------------------------------


def write(path, text):
    with open(path, "w", encoding="utf-8", newline="\n") as f:
        f.write(text)


def main():
    rng = random.Random(SEED)
    hd_lines, hd_kinds = build_helpdesk(rng)
    notes, note_kinds = build_notes(rng)
    letters = build_letters(rng)

    problems = self_check(hd_lines, hd_kinds, notes, note_kinds, letters)
    if len(hd_lines) != HELPDESK_RECORDS:
        problems.append(f"helpdesk.jsonl has {len(hd_lines)} records, not {HELPDESK_RECORDS}")
    if problems:
        sys.stderr.write("\n".join(problems) + "\n")
        return 1

    write(os.path.join(HERE, "helpdesk.jsonl"), "\n".join(hd_lines) + "\n")
    write(os.path.join(HERE, "club-notes.txt"), "\n".join(notes) + "\n")
    write(os.path.join(HERE, "club-letters.txt"), "\n\n".join(letters) + "\n")

    shapes = {}
    for line in hd_lines:
        rec = json.loads(line)
        shapes[rec["channel"]] = shapes.get(rec["channel"], 0) + 1
    counts = {}
    for k in hd_kinds:
        counts[k] = counts.get(k, 0) + 1
    out = sys.stdout
    out.write(f"helpdesk.jsonl: {len(hd_lines)} records\n")
    for name in sorted(shapes):
        out.write(f"  channel {name}: {shapes[name]}\n")
    for name in sorted(counts):
        out.write(f"  {name}: {counts[name]}\n")
    out.write(f"club-notes.txt: {len(notes)} documents "
              f"({note_kinds.count('neutral')} without gendered mentions)\n")
    out.write(f"club-letters.txt: {len(letters)} documents\n")
    return 0


if __name__ == "__main__":
    sys.exit(main())
