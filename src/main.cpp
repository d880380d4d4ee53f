// evenhand's entry point: everything lives in the library; see src/cli/.
#include "cli/cli.h"

int main(int argc, char** argv) { return evenhand::cli::main(argc, argv); }
