import type { TransformCallback } from "node:stream";

import { Parser, type Options } from "csv-parse";

/** The records read from one chunk of the file, each with the line it starts on. */
export type NumberedRecords = { records: string[][]; lines: number[] };

/**
 * csv-parse's stream, handing on the records of each chunk of the file
 * together rather than one by one (a 100,000-line logbook is then a few
 * hundred stream writes, not 100,000), each with its line number.
 *
 * The line is read from the parser's own counter as each record is pushed:
 * the same number the `info: true` option reports, without the copy of every
 * counter that option makes for each record.
 */
export class NumberedCsvParser extends Parser {
  #records: string[][] = [];
  #lines: number[] = [];

  constructor(options: Omit<Options, "info" | "raw" | "columns" | "objname" | "on_record">) {
    // One batch waiting at a time (the stream's default is 16 objects): with
    // a chunk's records in each, memory stays flat however long the file.
    const stream = { readableHighWaterMark: 1 };
    super({ ...options, ...stream });
  }

  override push(chunk: unknown, encoding?: BufferEncoding): boolean {
    if (chunk === null) {
      this.#handOn();
      return super.push(null, encoding);
    }
    const record = chunk as string[];
    this.#records.push(record);
    this.#lines.push(startLine(this.info.lines, record));
    return true;
  }

  // After a malformed chunk the whole file is refused, so its records go no further.
  override _transform(chunk: Buffer, encoding: BufferEncoding, callback: TransformCallback): void {
    super._transform(chunk, encoding, (error, data) => {
      if (!error) this.#handOn();
      callback(error, data);
    });
  }

  override _flush(callback: TransformCallback): void {
    super._flush((error, data) => {
      if (!error) this.#handOn();
      callback(error, data);
    });
  }

  #handOn() {
    if (this.#records.length === 0) return;
    const batch: NumberedRecords = { records: this.#records, lines: this.#lines };
    this.#records = [];
    this.#lines = [];
    super.push(batch);
  }
}

/** csv-parse counts the line a record ends on; a quoted note may span several. */
export function startLine(endLine: number, record: string[]): number {
  let extra = 0;
  for (const field of record) {
    if (field.length > 0 && field.includes("\n")) extra += field.split("\n").length - 1;
  }
  return endLine - extra;
}
