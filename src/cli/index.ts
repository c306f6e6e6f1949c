// Public surface of the command line.
export { runCli, buildProgram, describeInputError, EXIT_INPUT, type CliIo, type CliDeps, type WorkbenchServer } from './program.js';
