import { parquetReadObjects, parquetMetadata, parquetSchema } from 'hyparquet'
import { compressors } from 'hyparquet-compressors'
import fs from 'fs'
for (const path of process.argv.slice(2)) {
  const buf = fs.readFileSync(path)
  const file = buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength)
  const meta = parquetMetadata(file)
  const rows = await parquetReadObjects({ file, compressors })
  const cols = meta.schema.slice(1).filter(s => s.num_children === undefined || s.num_children === 0).map(s => s.name)
  console.log(path.split('/').slice(-2).join('/'), 'rows', rows.length, 'first', JSON.stringify(rows[0], (k, v) => typeof v === 'bigint' ? Number(v) : v).slice(0, 300))
}
