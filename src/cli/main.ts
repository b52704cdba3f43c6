import { stat } from 'node:fs/promises';
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { EXIT, UsageError, type Io } from './io.ts';
import { ToolError } from '../problems.ts';
import { showControls } from '../format.ts';

interface Command {
  summary: string;
  usage: string;
  options: NonNullable<ParseArgsConfig['options']>;
  positionals: { min: number; max: number };
  run: (values: Record<string, string | boolean | undefined>, positionals: string[], io: Io) => Promise<number>;
}

// Each command loads its modules only when it runs: `check` need not pay for Eleventy and puppeteer.
const COMMANDS: Record<string, Command> = {
  check: {
    summary: 'validate a data folder and list every problem',
    usage: `loopsheet check [--data DIR] [--json]

Validates every input file and prints each problem with file, line, column, the value and
what was expected. Exit 0 when there are no errors (warnings allowed), 1 with errors.

  --data DIR   the data folder (default ./data)
  --json       print the problems as a JSON array on stdout`,
    options: { data: { type: 'string' }, json: { type: 'boolean' } },
    positionals: { min: 0, max: 0 },
    run: async (values, _positionals, io) => (await import('./check.ts')).runCheck({ data: str(values.data) ?? 'data', json: values.json === true }, io),
  },
  build: {
    summary: 'validate, compute and render the declarations',
    usage: `loopsheet build [--data DIR] [--out DIR] [--no-pdf] [--pdf] [--changed] [--shard K/N] [--uncertainty]

Validates the data folder and renders the site into --out. Nothing is written when
validation fails, and a failed build leaves the previous output untouched. The same inputs
give the same bytes.

  --data DIR   the data folder (default ./data)
  --out DIR    the output folder (default ./out)
  --no-pdf     skip the PDF files
  --pdf        require PDFs: fail when no browser is found
  --changed    rebuild only the products whose inputs (their rows and every row they
               reach) changed since the build in --out; keep the others' files, refresh
               the catalogue and the manifest, and print what was rebuilt and why
  --shard K/N  build the K-th of N shares of the products (a family's members in one
               share, the shares balanced by product count), for a CI matrix; join
               the shards with loopsheet merge
  --uncertainty  run the Monte Carlo uncertainty analysis (inputs with a gsd column vary;
               iterations and seed from declaration.json uncertainty, else 1 000 and 1)`,
    options: { data: { type: 'string' }, out: { type: 'string' }, 'no-pdf': { type: 'boolean' }, pdf: { type: 'boolean' }, changed: { type: 'boolean' }, shard: { type: 'string' }, uncertainty: { type: 'boolean' } },
    positionals: { min: 0, max: 0 },
    run: async (values, _positionals, io) => {
      const shard = str(values.shard);
      return (await import('./build.ts')).runBuild(
        {
          data: str(values.data) ?? 'data',
          out: str(values.out) ?? 'out',
          pdf: values['no-pdf'] === true ? 'off' : values.pdf === true ? 'required' : 'auto',
          changed: values.changed === true,
          uncertainty: values.uncertainty === true,
          ...(shard !== undefined ? { shard: (await import('../render/shards.ts')).parseShard(shard) } : {}),
        },
        io,
      );
    },
  },
  merge: {
    summary: 'join the outputs of build --shard K/N into one site',
    usage: `loopsheet merge DIR... [--out DIR]

Joins the output folders of "loopsheet build --shard K/N" (every K of one N, same inputs and
tool version) into one site with one catalogue, one factor table and one verification
manifest: the same files a single build writes.

  --out DIR    the output folder (default ./out)`,
    options: { out: { type: 'string' } },
    positionals: { min: 1, max: Number.POSITIVE_INFINITY },
    run: async (values, positionals, io) => (await import('./merge.ts')).runMerge({ dirs: positionals, out: str(values.out) ?? 'out' }, io),
  },
  serve: {
    summary: 'preview the site on localhost, rebuilt and reloaded as the data change',
    usage: `loopsheet serve [--data DIR] [--port N] [--out DIR]

Builds the site (no PDFs), serves it on localhost, watches the data folder, rebuilds only
the products whose inputs changed and reloads the open page. While the inputs have
errors, every page shows them (file, line, column, message) instead of stale results.
Runs until stopped with Ctrl-C.

  --data DIR   the data folder (default ./data)
  --port N     the port (default 8080)
  --out DIR    where the preview is built (default: a folder of its own in the system's
               temporary folder; never your published out/)`,
    options: { data: { type: 'string' }, port: { type: 'string' }, out: { type: 'string' } },
    positionals: { min: 0, max: 0 },
    run: async (values, _positionals, io) => {
      const port = Number(str(values.port) ?? '8080');
      if (!Number.isInteger(port) || port < 0 || port > 65535) throw new UsageError(`--port ${str(values.port)}: expected a port number from 0 to 65535 (0: any free port)`);
      const out = str(values.out);
      return (await import('./serve.ts')).runServe({ data: str(values.data) ?? 'data', port, ...(out ? { out } : {}) }, io);
    },
  },
  explain: {
    summary: 'show how a figure is derived, down to the input cells',
    usage: `loopsheet explain PRODUCT FIGURE_ID [--data DIR] [--depth N]

Prints the derivation of one figure of a product as a tree: each step's formula and
value, down to the CSV cells (file, line, column, value as written). A figure id is a
step of results.json "graph", followed by an indicator where the step has one value per
indicator: cutoff/A1/GWP-total, cutoff/A1/line:L1/AP, cutoff/D/GWP-total,
cff/total/GWP-total, inventory/line:L1/G, flows/recycled_content/total.

  --data DIR   the data folder (default ./data)
  --depth N    stop after N levels (default: all the way down)`,
    options: { data: { type: 'string' }, depth: { type: 'string' } },
    positionals: { min: 2, max: 2 },
    run: async (values, positionals, io) => {
      const depth = values.depth === undefined ? Infinity : Number(values.depth);
      if (depth !== Infinity && (!Number.isInteger(depth) || depth < 0)) throw new UsageError(`--depth ${String(values.depth)}: expected a whole number`);
      return (await import('./explain.ts')).runExplain({ data: str(values.data) ?? 'data', product: positionals[0]!, figure: positionals[1]!, depth }, io);
    },
  },
  chem: {
    summary: 'balance and weigh a reaction (molar masses, mass ratios, atom economy)',
    usage: `loopsheet chem "REACTION" [--per SPECIES] [--unit kg|t] [--json]

Reads a reaction such as "2Al2O3 + 3C -> 4Al + 3CO2", checks that every element and the
charge balance (and says which do not), and prints each species' molar mass from the IUPAC
standard atomic weights and its mass per kg (or tonne) of the chosen species, with the
atom economy. A reaction written without any coefficient ("Al2O3 + C -> Al + CO2") is
balanced first, with exact rational arithmetic, and the coefficients found are printed; one
that has no balance, or more than one, is said to. An unbalanced reaction gets no masses.
Formulas may hold parentheses, hydrates (CuSO4·5H2O) and charges (Al^3+, Al³⁺, and as ionic
equations write them: Cu2+, Fe3+, NH4+, SO42-, Na+, e-). Separate species with " + "
(spaces around the plus).

  --per SPECIES   the species the masses are given per (default: the first product)
  --unit kg|t     label the ratios per kg or per tonne (the same numbers)
  --json          print the result as JSON on stdout

Exit 0 when the reaction balances (as written or as balanced), 1 when it does not or cannot be\nbalanced, 2 when it cannot be read.`,
    options: { per: { type: 'string' }, unit: { type: 'string' }, json: { type: 'boolean' } },
    positionals: { min: 1, max: 1 },
    run: async (values, positionals, io) => {
      const unit = str(values.unit) ?? 'kg';
      if (unit !== 'kg' && unit !== 't') throw new UsageError(`--unit ${unit}: expected kg or t`);
      return (await import('./chem.ts')).runChem({ reaction: positionals[0]!, per: str(values.per), unit, json: values.json === true }, io);
    },
  },
  diff: {
    summary: 'report which figures moved between two builds, and the input cells behind them',
    usage: `loopsheet diff OLD NEW [--threshold 1%] [--format md|json] [--fail-over 5%] [--fail-over-methods declared|all]

Compares two builds (two output folders, or two results.json files or folders of them):
every product × method × module × indicator whose value changed by more than the threshold,
with old, new, absolute and relative change, and the input cells that changed underneath it
(found through the figure graphs of both builds; rows matched by their key columns, so a
row that moved to another line is still the same row). Products added or removed are
listed. Markdown is short enough to paste as a review comment; JSON lists every change.

  --threshold SHARE  report changes larger than this (default 1%; 0 reports every change)
  --format md|json   Markdown (default) or JSON on stdout
  --fail-over SHARE  exit 1 when a headline figure of the declared result (cut-off GWP-total
                     of A1-A3, D and the total; recycled content) moved by more than this share
  --fail-over-methods declared|all
                     all: guard the comparison methods' totals too (CFF, 0:100, 50:50)

The declared result (cut-off, with D) is listed first; the methods shown for comparison only
follow.

Both sides must be results format 2 (loopsheet 0.2 and later); a build of an earlier
format is named as one to build again (exit 2).

Shares are written 1%, 0.5 % or 0.01. Exit 0, 1 over --fail-over, 2 usage errors.`,
    options: { threshold: { type: 'string' }, format: { type: 'string' }, 'fail-over': { type: 'string' }, 'fail-over-methods': { type: 'string' } },
    positionals: { min: 2, max: 2 },
    run: async (values, positionals, io) => {
      const { parseShare, runDiff } = await import('./diff.ts');
      const format = str(values.format) ?? 'md';
      if (format !== 'md' && format !== 'json') throw new UsageError(`--format ${format}: expected md or json`);
      const failOver = str(values['fail-over']);
      const failOverMethods = str(values['fail-over-methods']) ?? 'declared';
      if (failOverMethods !== 'declared' && failOverMethods !== 'all') throw new UsageError(`--fail-over-methods ${failOverMethods}: expected declared or all`);
      return runDiff(
        {
          old: positionals[0]!,
          new: positionals[1]!,
          threshold: parseShare(str(values.threshold) ?? '1%', '--threshold'),
          ...(failOver !== undefined ? { failOver: parseShare(failOver, '--fail-over') } : {}),
          failOverMethods,
          format,
        },
        io,
      );
    },
  },
  keygen: {
    summary: 'make a verifier’s Ed25519 key pair (PEM)',
    usage: `loopsheet keygen --out DIR [--name NAME]

Writes NAME.key.pem (the private key, readable by you alone) and NAME.pub.pem (the public
key) into DIR, and prints the public key's fingerprint. DIR may not be a data folder or a
build's output, nor lie inside one: a private key is kept apart from both.

  --out DIR    where to write the two files
  --name NAME  the files' name (default verifier)`,
    options: { out: { type: 'string' }, name: { type: 'string' } },
    positionals: { min: 0, max: 0 },
    run: async (values, _positionals, io) => {
      const out = str(values.out);
      if (!out) throw new UsageError('keygen: --out DIR is required (a folder outside every data folder and output)');
      return (await import('./verify.ts')).runKeygen({ out, name: str(values.name) ?? 'verifier' }, io);
    },
  },
  verify: {
    summary: 'sign a verification record of a build you checked (verifiers)',
    usage: `loopsheet verify --key KEY.pem --verifier NAME [--data DIR] [--out DIR] [--date YYYY-MM-DD] [--programme TEXT] [--products ID,…] [--families ID,…]

For the independent verifier, run on the build they checked: writes verification-record.json
into the data folder — verifier, date, programme, scope, the tool version, and the SHA-256 of
every input file, of declaration.json, of each covered product's and family's results.json
and of every input row each covered product reads — signed with the verifier's Ed25519
private key, and the public key beside it (verifier.pub.pem). From then on a declaration is
shown as verified only while the signature checks and nothing it covers has changed. The
build in --out must have been made from the data folder as it is, by this version.

  --key KEY.pem      the verifier's private key (loopsheet keygen); never inside the data
                     folder or the output
  --verifier NAME    the verifier's name as the declarations print it
  --data DIR         the data folder (default ./data)
  --out DIR          the build that was checked (default ./out)
  --date DATE        the date of verification (default today)
  --programme TEXT   the programme operator and programme
  --products ID,…    the products verified (default every product)
  --families ID,…    the families verified (default every family)`,
    options: { key: { type: 'string' }, verifier: { type: 'string' }, data: { type: 'string' }, out: { type: 'string' }, date: { type: 'string' }, programme: { type: 'string' }, products: { type: 'string' }, families: { type: 'string' } },
    positionals: { min: 0, max: 0 },
    run: async (values, _positionals, io) => {
      const key = str(values.key);
      const verifier = str(values.verifier);
      if (!key) throw new UsageError('verify: --key KEY.pem is required (the verifier’s private key)');
      if (!verifier) throw new UsageError('verify: --verifier NAME is required');
      const list = (value: string | undefined) => (value === undefined ? undefined : value.split(',').map((item) => item.trim()).filter(Boolean));
      const products = list(str(values.products));
      const families = list(str(values.families));
      return (await import('./verify.ts')).runVerify(
        {
          key,
          verifier,
          data: str(values.data) ?? 'data',
          out: str(values.out) ?? 'out',
          date: str(values.date) ?? new Date().toISOString().slice(0, 10),
          programme: str(values.programme) ?? '',
          ...(products ? { products } : {}),
          ...(families ? { families } : {}),
        },
        io,
      );
    },
  },
  init: {
    summary: 'scaffold a new data folder',
    usage: `loopsheet init DIR [--force]

Writes every input file with its header row and a commented example row, a starting
declaration.json and a README explaining each column with its unit.

  --force      write into a folder that already has files (existing input files are kept)`,
    options: { force: { type: 'boolean' } },
    positionals: { min: 1, max: 1 },
    run: async (values, positionals, io) => (await import('./init.ts')).runInit({ dir: positionals[0]!, force: values.force === true }, io),
  },
  schema: {
    summary: 'write the JSON Schema and the column reference',
    usage: `loopsheet schema [--out DIR]

Writes declaration.schema.json, a JSON Schema per CSV row and columns.md (the column
reference of every CSV), all generated from the zod schemas the checks use, and
results.schema.json, the JSON Schema of each product's results.json (format 2).

  --out DIR    where to write (default ./schema)`,
    options: { out: { type: 'string' } },
    positionals: { min: 0, max: 0 },
    run: async (values, _positionals, io) => (await import('./schema.ts')).runSchema({ out: str(values.out) ?? 'schema' }, io),
  },
};

const str = (value: string | boolean | undefined): string | undefined => (typeof value === 'string' ? value : undefined);

function mainHelp(): string {
  const width = Math.max(...Object.keys(COMMANDS).map((name) => name.length));
  return `loopsheet — product impact declarations for metal products, from CSV

usage: loopsheet COMMAND [options]

${Object.entries(COMMANDS)
  .map(([name, command]) => `  ${name.padEnd(width)}  ${command.summary}`)
  .join('\n')}

Run "loopsheet COMMAND --help" for a command's options.
Exit codes: 0 ok, 1 input errors, 2 usage errors, 3 internal failure.`;
}

/** Everything a command writes goes through here, with control characters from input text shown as escapes (`showControls`). */
/** Why a data folder cannot be read, or undefined when it is a folder. */
async function folderMissing(dir: string): Promise<string | undefined> {
  try {
    return (await stat(dir)).isDirectory() ? undefined : 'is a file, not a folder';
  } catch {
    return 'does not exist';
  }
}

export const processIo: Io = {
  out: (text) => void process.stdout.write(showControls(text.endsWith('\n') ? text : `${text}\n`)),
  err: (text) => void process.stderr.write(showControls(text.endsWith('\n') ? text : `${text}\n`)),
  isTty: Boolean(process.stderr.isTTY) && process.env.CI !== 'true',
};

export async function main(argv: string[], io: Io = processIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    if (name === 'help' && rest[0] && COMMANDS[rest[0]]) {
      io.out(COMMANDS[rest[0]]!.usage);
      return EXIT.ok;
    }
    (name === undefined ? io.err : io.out)(mainHelp());
    return name === undefined ? EXIT.usage : EXIT.ok;
  }
  if (name === '--version' || name === '-v') {
    io.out((await import('../reference/tool.ts')).TOOL_VERSION);
    return EXIT.ok;
  }
  const command = COMMANDS[name];
  if (!command) {
    io.err(`loopsheet: unknown command "${name}"\n\n${mainHelp()}`);
    return EXIT.usage;
  }
  let parsed;
  try {
    parsed = parseArgs({ args: rest, options: { ...command.options, help: { type: 'boolean', short: 'h' } }, allowPositionals: true, strict: true });
  } catch (error) {
    io.err(`loopsheet ${name}: ${(error as Error).message}\n\n${command.usage}`);
    return EXIT.usage;
  }
  if (parsed.values.help) {
    io.out(command.usage);
    return EXIT.ok;
  }
  const values = parsed.values as Record<string, string | boolean | undefined>;
  const { min, max } = command.positionals;
  if (parsed.positionals.length < min || parsed.positionals.length > max) {
    // `check mine`: a folder given without --data.
    const extra = parsed.positionals[max];
    const meant = extra !== undefined && 'data' in command.options && values.data === undefined ? `; did you mean --data ${extra}?` : '';
    io.err(`loopsheet ${name}: expected ${min === max ? min : `${min}–${max}`} argument${max === 1 ? '' : 's'}, got ${parsed.positionals.length}${meant}\n\n${command.usage}`);
    return EXIT.usage;
  }
  if ('data' in command.options) {
    const data = typeof values.data === 'string' ? values.data : 'data';
    const missing = await folderMissing(data);
    if (missing) {
      io.err(`loopsheet ${name}: the data folder ${data} ${missing}${values.data === undefined ? ' (the default; give --data DIR)' : ''}`);
      return EXIT.usage;
    }
  }
  try {
    return await command.run(values, parsed.positionals, io);
  } catch (error) {
    if (error instanceof ToolError && error.kind !== 'internal') {
      io.err(`loopsheet ${name}: ${error.message}`);
      return error.kind === 'usage' ? EXIT.usage : EXIT.input;
    }
    io.err(`loopsheet ${name}: internal failure: ${(error as Error).stack ?? String(error)}`);
    return EXIT.internal;
  }
}
