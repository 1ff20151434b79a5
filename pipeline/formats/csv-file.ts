/** A CSV file read record by record (pipeline/formats/csv.ts parses; this file streams it from disk). */
import { createReadStream } from 'node:fs';
import { CsvParser, type CsvRecord } from './csv.ts';

/** Yields every record of a CSV file with the line it starts on, streamed [memory: one record]. */
export async function* readCsvRecords(path: string): AsyncGenerator<CsvRecord> {
  const parser = new CsvParser(path);
  for await (const chunk of createReadStream(path, { encoding: 'utf8', highWaterMark: 1 << 16 })) {
    yield* parser.push(chunk as string);
  }
  yield* parser.end();
}
