'use client';
// SWR over a list that the page's server component has just read. SWR prefers its own cache to
// `fallbackData`, so after a client-side navigation back to a page, a list cached on an earlier
// visit (an empty listings table, say) would be shown over the fresh server copy until the next
// revalidation, which SWR's de-duplication can hold back for seconds. Here the server's copy is
// written into the cache whenever the page brings a new one (each server render is a new object),
// and SWR's own polling and revalidation go on from there. A component that mounts again on the same
// page (a panel shown again) keeps what the cache has learnt since: its server copy is not new.
import { useEffect } from 'react';
import useSWR, { type SWRConfiguration } from 'swr';
import { fetchData, type ApiRequestError } from '@/lib/http/client';

/** The last server copy written into the cache, per key. */
const seeded = new Map<string, unknown>();

/**
 * Guarantee: the data shown is never older than `serverCopy`, the copy this page's server render
 * brought (pass the object the server component gave, so that its identity tells a new render).
 */
export function useServerSeededSWR<T extends object>(url: string | null, serverCopy: T, options: Omit<SWRConfiguration<T, ApiRequestError>, 'fallbackData'> = {}) {
  const result = useSWR<T, ApiRequestError>(url, fetchData, { ...options, fallbackData: serverCopy });
  const { mutate } = result;
  useEffect(() => {
    if (url === null || seeded.get(url) === serverCopy) return;
    seeded.set(url, serverCopy);
    void mutate(serverCopy, { revalidate: false });
  }, [url, serverCopy, mutate]);
  return result;
}
