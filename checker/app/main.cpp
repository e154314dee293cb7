#include "checker/app/cli.h"

int main(int argc, char **argv) { return gateloop::runCli(argc, argv); }
