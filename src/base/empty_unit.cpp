// Placeholder translation unit for a layer that has no sources yet.
namespace evenhand {
void empty_unit_placeholder() {}
}  // namespace evenhand
