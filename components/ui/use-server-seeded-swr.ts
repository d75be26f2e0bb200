'use client';
// SWR over a list that the page's server component has just read. SWR prefers its own cache to
// `fallbackData`, so after a client-side navigation back to a page, a list cached on an earlier
// visit (an empty listings table, say) would be shown over the fresh server copy until the next
// revalidation, which SWR's de-duplication can hold back for seconds. Here the server's copy is
// written into the cache whenever the page brings one, and SWR's own polling and revalidation go on
// from there.
import { useEffect } from 'react';
import useSWR, { type SWRConfiguration } from 'swr';
import { fetchData, type ApiRequestError } from '@/lib/http/client';

/** Guarantee: the data shown is never older than `serverCopy`, the copy this render of the page brought. */
export function useServerSeededSWR<T>(url: string | null, serverCopy: T, options: Omit<SWRConfiguration<T, ApiRequestError>, 'fallbackData'> = {}) {
  const result = useSWR<T, ApiRequestError>(url, fetchData, { ...options, fallbackData: serverCopy });
  const { mutate } = result;
  useEffect(() => {
    void mutate(serverCopy, { revalidate: false });
  }, [serverCopy, mutate]);
  return result;
}
