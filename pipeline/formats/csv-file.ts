/** A CSV file read record by record (pipeline/formats/csv.ts parses; this file streams it from disk). */
import { createReadStream } from 'node:fs';
import { CsvParser, type CsvRecord } from './csv.ts';

/**
 * Yields every record of a CSV file with the line it starts on, streamed [memory: one record]; or
 * of a text stream `input` (e.g. standard input, `path` then only names it in errors).
 */
export async function* readCsvRecords(path: string, input?: NodeJS.ReadableStream): AsyncGenerator<CsvRecord> {
  const parser = new CsvParser(path);
  for await (const chunk of input ?? createReadStream(path, { encoding: 'utf8', highWaterMark: 1 << 16 })) {
    yield* parser.push(chunk as string);
  }
  yield* parser.end();
}
