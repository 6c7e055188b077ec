import Papa from 'papaparse';
import type { Progress } from './upload';

export interface FileSummary {
  fields: string[];
  rows: number;
  /** Records papaparse could not split cleanly (unpaired quotes, a field too many or too few). */
  malformed: number;
}

/** Reads a CSV file on this device in slices, for its header, its size in rows and a progress bar. */
export function readCsvFile(file: File, onProgress: Progress): Promise<FileSummary> {
  return new Promise((resolve, reject) => {
    const out: FileSummary = { fields: [], rows: 0, malformed: 0 };
    Papa.parse<Record<string, string>>(file, {
      header: true,
      skipEmptyLines: 'greedy',
      transformHeader: (h) => h.trim().toLowerCase(),
      chunkSize: 256 * 1024,
      // meta.cursor counts characters read so far across slices; against the size in bytes it is close enough for a bar.
      chunk: (r) => {
        out.fields = r.meta.fields ?? out.fields;
        out.rows += r.data.length;
        out.malformed += new Set(r.errors.map((e) => e.row)).size;
        onProgress(Math.min(1, r.meta.cursor / Math.max(1, file.size)));
      },
      complete: () => {
        onProgress(1);
        resolve(out);
      },
      error: (e) => reject(new Error(`The file could not be read: ${e.message}`)),
    });
  });
}
