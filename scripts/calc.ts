/**
 * Command-line entry to the pure engines: `npm run --silent calc -- VERB`, one JSON value on stdin,
 * one JSON value on stdout. Bad input: exit 2 with {"error":{"code":"invalid_input",...}}.
 */
import { hasKey } from '../common/src/api/lookup';
import { calcVerbs } from '../common/src/calc/verbs';
import { InvalidInputError, type ErrorBody } from '../common/src/api/errors';

function fail(body: ErrorBody, exitCode: number): never {
  process.stdout.write(JSON.stringify(body) + '\n');
  process.exit(exitCode);
}

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

async function main(): Promise<void> {
  const verb = process.argv[2];
  const known = Object.keys(calcVerbs).sort();
  if (!verb || !hasKey(calcVerbs, verb)) {
    fail(
      {
        error: {
          code: 'invalid_input',
          message: verb ? `Unknown verb "${verb}". Known verbs: ${known.join(', ')}` : `Name a verb: ${known.join(', ')}`,
          details: [{ path: 'verb', message: 'unknown or missing verb' }],
        },
      },
      2,
    );
  }
  const text = await readStdin();
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (e) {
    fail(
      {
        error: {
          code: 'invalid_input',
          message: text.trim() === '' ? 'No JSON on standard input' : `Standard input is not valid JSON: ${(e as Error).message}`,
          details: [{ path: '(root)', message: 'expected one JSON value' }],
        },
      },
      2,
    );
  }
  try {
    const output = calcVerbs[verb](input);
    process.stdout.write(JSON.stringify(output) + '\n');
  } catch (e) {
    if (e instanceof InvalidInputError) {
      fail({ error: { code: e.code, message: e.message, details: e.details } }, 2);
    }
    fail({ error: { code: 'internal_error', message: (e as Error).message ?? 'calculation failed' } }, 1);
  }
}

void main();
