// The browser entry of hyparquet-writer 0.17.0: pure, no Node file system.
import { parquetWriteBuffer } from 'hyparquet-writer/src/index.js';
import type { SampleTable } from './samples.ts';

// The sample table as Apache Parquet (an open columnar format read by pandas, R's
// arrow, GDAL and DuckDB alike): strings as UTF-8 byte arrays, integers as INT32,
// the rest as DOUBLE; nulls where a value is missing. Provenance goes in the file's
// key-value metadata.

const types = { string: 'STRING', int: 'INT32', float: 'DOUBLE' } as const;

export function samplesParquet(table: SampleTable, metadata: Record<string, string> = {}): Uint8Array {
  const buffer = parquetWriteBuffer({
    columnData: table.columns.map((c) => ({ name: c.name, data: c.values, type: types[c.type], nullable: true })),
    kvMetadata: Object.entries(metadata).map(([key, value]) => ({ key, value })),
    createdBy: 'fellfield',
  });
  return new Uint8Array(buffer);
}
