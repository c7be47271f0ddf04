// `npm run --silent cli -- <verb> FILE [options]`: the command-line contract (../shared/contracts/CLI.md).
const USAGE = `Usage: npm run --silent cli -- <verb> FILE [options]

Verbs (see the command-line contract):
  parse FILE --json        read an export through the parsers        (not built yet)
  ingest FILE [--json]     store an export in DATABASE_FILE          (not built yet)
  fit FILE --model NAME    fit a kinetic model                       (not built yet)
  arrhenius FILE --json    activation energy and Eyring parameters   (not built yet)
`;

function main(argv: string[]): number {
  const verb = argv[0];
  if (!verb || verb === "--help" || verb === "help") {
    process.stdout.write(USAGE);
    return verb ? 0 : 2;
  }
  process.stderr.write(`halflight: the verb "${verb}" is not available yet.\n\n${USAGE}`);
  return 2;
}

process.exitCode = main(process.argv.slice(2));
