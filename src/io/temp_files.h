// The process's hidden temporary output files (the sinks' files beside their targets), kept
// in one registry so that a process told to stop can remove every one of them. Creating,
// removing and renaming a temporary file all happen under the registry's lock.
#pragma once

#include <mutex>
#include <string>

namespace evenhand::io {

// Removes every temporary output file of this process and keeps the registry locked for
// good: from then on no temporary file can be created or renamed into place (a thread that
// tries waits forever). For a process about to end, e.g. on a signal; call it from an
// ordinary thread (it locks a mutex), never from a signal handler. If a set of outputs is
// being renamed into place, it waits until the whole set is renamed.
void abandon_temp_files();

// For io's own use (sink.cpp, output_set.cpp).
namespace temp_files {
// The registry's lock.
std::unique_lock<std::mutex> lock();
// Records or forgets a temporary file; the caller holds lock().
void add(const std::string& path);
void remove(const std::string& path);
}  // namespace temp_files

}  // namespace evenhand::io
