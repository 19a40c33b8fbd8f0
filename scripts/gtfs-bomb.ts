/**
 * Builds hostile GTFS feeds for the import's bounds: a small zip whose shapes.txt unpacks to any
 * size (a "zip bomb": one valid row repeated, which deflate shrinks about a thousandfold) with
 * the other files of a valid one-route feed. Used by the import tests and by
 * scripts/bench-gtfs-bomb.ts.
 */
import { Readable } from 'node:stream';
import yazl from 'yazl';

export interface BombOptions {
  /** Unpacked size of shapes.txt, bytes. */
  shapesBytes: number;
  /** Shape of the repeated rows: the route's own (default) or one no trip uses. */
  shapeId?: 's1' | 'unused';
}

const HEADER = 'shape_id,shape_pt_lat,shape_pt_lon,shape_pt_sequence\n';

/** The feed as one zip in memory (it is small however large it unpacks). */
export async function gtfsBomb({ shapesBytes, shapeId = 's1' }: BombOptions): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  const small: Record<string, string> = {
    'routes.txt': 'route_id,route_short_name,route_long_name,route_type\nr1,1,Bomb Line,3\n',
    'trips.txt': 'route_id,service_id,trip_id,direction_id,shape_id\nr1,all,t1,0,s1\n',
    'stops.txt': 'stop_id,stop_name,stop_lat,stop_lon\nA,Top,46.5,9.0\n',
    'stop_times.txt': 'trip_id,arrival_time,departure_time,stop_id,stop_sequence\nt1,07:00:00,07:00:00,A,1\n',
  };
  for (const [name, text] of Object.entries(small)) zip.addBuffer(Buffer.from(text), name);
  zip.addReadStream(repeatedRows(`${shapeId},46.50000,9.00000,1\n`, shapesBytes), 'shapes.txt', { compress: true });
  zip.end();
  const chunks: Buffer[] = [];
  for await (const chunk of zip.outputStream as AsyncIterable<Buffer>) chunks.push(chunk);
  return Buffer.concat(chunks);
}

/** The header then one row over and over, about `totalBytes` in all (whole rows), 1 MiB at a time. */
function repeatedRows(row: string, totalBytes: number): Readable {
  const block = Buffer.from(row.repeat(Math.floor((1024 * 1024) / row.length)));
  let left = HEADER.length + Math.floor((totalBytes - HEADER.length) / row.length) * row.length;
  let first = true;
  return new Readable({
    read() {
      if (left <= 0) {
        this.push(null);
        return;
      }
      const chunk = first ? Buffer.concat([Buffer.from(HEADER), block]) : block;
      first = false;
      const piece = chunk.length <= left ? chunk : chunk.subarray(0, left);
      left -= piece.length;
      this.push(piece);
    },
  });
}
