'use client';
// SWR over a list that the page's server component has just read. SWR prefers its own cache to
// `fallbackData`, so after a client-side navigation back to a page, a list cached on an earlier
// visit (an empty listings table, say) would be shown over the fresh server copy until the next
// revalidation, which SWR's de-duplication can hold back for seconds. Here the server's copy is
// written into the cache whenever the page brings a new one (each server render is a new object),
// and SWR's own polling and revalidation go on from there. Coming back to the server's key (a
// filter cleared, a period chosen again) keeps what the cache has learnt since: the copy is not new.
import { useEffect } from 'react';
import useSWR, { type SWRConfiguration } from 'swr';
import { fetchData, type ApiRequestError } from '@/lib/http/client';

/** The last server copy written into the cache, per key. */
const seeded = new Map<string, unknown>();

/**
 * Guarantee: the data shown is never older than `serverCopy`, the copy this render of the page brought.
 *
 * `serverUrl` is the key the server copy answers, for a list that can also be asked for with other
 * keys (a filter, a period): under another key there is no server copy, and SWR reads it as usual.
 */
export function useServerSeededSWR<T>(
  url: string | null,
  serverCopy: T,
  options: Omit<SWRConfiguration<T, ApiRequestError>, 'fallbackData'> = {},
  serverUrl: string | null = url,
) {
  const seeds = url !== null && url === serverUrl;
  const result = useSWR<T, ApiRequestError>(url, fetchData, { ...options, fallbackData: seeds ? serverCopy : undefined });
  const { mutate } = result;
  useEffect(() => {
    if (!seeds || seeded.get(url) === serverCopy) return;
    seeded.set(url, serverCopy);
    void mutate(serverCopy, { revalidate: false });
  }, [seeds, url, serverCopy, mutate]);
  return result;
}
