// Fetches a calendar feed's text: at most 10 s and 5 MB, so a slow or huge answer cannot hold the sync.

export const FEED_TIMEOUT_MS = 10_000;
export const FEED_MAX_BYTES = 5 * 1024 * 1024;

export class FeedFetchError extends Error {}

export interface FetchLimits {
  timeoutMs?: number;
  maxBytes?: number;
}

export async function fetchCalendar(url: string, limits: FetchLimits = {}): Promise<string> {
  const timeoutMs = limits.timeoutMs ?? FEED_TIMEOUT_MS;
  const maxBytes = limits.maxBytes ?? FEED_MAX_BYTES;
  const protocol = new URL(url).protocol;
  if (protocol !== 'http:' && protocol !== 'https:') throw new FeedFetchError('Only http:// and https:// addresses can be loaded.');
  const abort = new AbortController();
  const timer = setTimeout(() => abort.abort(), timeoutMs);
  const limit = maxBytes >= 1024 * 1024 ? `${Math.round(maxBytes / 1024 / 1024)} MB` : `${maxBytes} bytes`;
  const tooBig = () => new FeedFetchError(`The calendar is larger than ${limit}. Ask for a shorter feed (fewer past events).`);
  try {
    const res = await fetch(url, { signal: abort.signal, redirect: 'follow', headers: { accept: 'text/calendar, text/plain;q=0.5, */*;q=0.1' } });
    if (!res.ok) {
      await res.body?.cancel().catch(() => undefined);
      throw new FeedFetchError(`${res.status} ${res.statusText || 'error'}`.trim());
    }
    if (Number(res.headers.get('content-length') ?? 0) > maxBytes) {
      await res.body?.cancel().catch(() => undefined);
      throw tooBig();
    }
    if (!res.body) return '';
    const reader = res.body.getReader();
    const chunks: Uint8Array[] = [];
    let bytes = 0;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      bytes += value.byteLength;
      if (bytes > maxBytes) {
        await reader.cancel().catch(() => undefined);
        throw tooBig();
      }
      chunks.push(value);
    }
    return new TextDecoder('utf-8').decode(Buffer.concat(chunks));
  } catch (e) {
    if (e instanceof FeedFetchError) throw e;
    if (abort.signal.aborted) throw new FeedFetchError(`No answer within ${timeoutMs / 1000} s. Check the address, or try again later.`);
    const cause = (e as { cause?: { code?: string; message?: string } }).cause;
    throw new FeedFetchError(`Could not reach the address (${cause?.code ?? cause?.message ?? (e instanceof Error ? e.message : String(e))}).`);
  } finally {
    clearTimeout(timer);
  }
}
