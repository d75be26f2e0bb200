'use client';
// Listing versions in the buyer's library: the notice of a newer version an owner has not
// downloaded yet, and a download for each version they may have — the newest and the one they
// bought (each a short-lived link, every download logged).
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { postJson } from '@/lib/http/client';
import type { DownloadResponse, LibraryItem } from '@/lib/market/types';

/** The library's notice: presets with a newer version for their owner, free. */
export function UpdateNotices({ items }: { items: LibraryItem[] }) {
  const updated = items.filter((item) => item.updateNotice);
  if (updated.length === 0) return null;
  return (
    <div role="status" data-testid="update-notice" className="flex flex-col gap-1 rounded-2xl border-l-4 border-bracken bg-vellum px-4 py-3 text-sm">
      <p className="font-semibold">New versions for you, at no cost</p>
      <ul className="list-disc pl-5">
        {updated.map((item) => (
          <li key={item.purchaseId}>
            <a href={`#purchase-${item.purchaseId}`} className="font-semibold text-tarn">
              {item.listing.title}
            </a>
            : version {item.updateNotice!.number} is in your library (you bought version {item.boughtVersion}, which stays yours too).
          </li>
        ))}
      </ul>
    </div>
  );
}

/** One download for each version the owner may have, newest first; a single one when there is only the bought version. */
export function VersionDownloads({ item, onDownloaded }: { item: LibraryItem; onDownloaded: () => void }) {
  if (item.versions.length <= 1) {
    return <DownloadButton item={item} label={item.packageReady ? 'Download the package' : 'Download (being packed)'} onDownloaded={onDownloaded} />;
  }
  return (
    <div className="flex flex-wrap items-start gap-3" data-testid="version-downloads">
      {item.versions.map((version) => (
        <DownloadButton
          key={version.number}
          item={item}
          version={version.number}
          look={version.number === item.currentVersion ? 'primary' : 'quiet'}
          label={`Download version ${version.number}${version.number === item.currentVersion ? ' (newest)' : ''}${version.number === item.boughtVersion ? ' (the one you bought)' : ''}${version.packageReady ? '' : ' — being packed'}`}
          onDownloaded={onDownloaded}
        />
      ))}
    </div>
  );
}

function DownloadButton({
  item,
  version,
  label,
  look,
  onDownloaded,
}: {
  item: LibraryItem;
  version?: number;
  label: string;
  look?: 'primary' | 'quiet';
  onDownloaded: () => void;
}) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function download() {
    setBusy(true);
    setProblem(null);
    const query = version === undefined ? '' : `?version=${version}`;
    const outcome = await postJson<DownloadResponse>(`/api/library/${item.purchaseId}/download${query}`, {});
    setBusy(false);
    if (!outcome.ok) {
      setProblem(outcome.error.message);
      return;
    }
    // The link is an attachment: the browser saves the file and stays on this page.
    const link = document.createElement('a');
    link.href = outcome.data.url;
    link.download = outcome.data.fileName;
    document.body.append(link);
    link.click();
    link.remove();
    // The download is counted: show the new count.
    onDownloaded();
  }
  return (
    <div className="flex flex-col gap-2">
      <Button onClick={download} disabled={busy} look={look ?? 'primary'}>
        {busy ? 'Preparing the download…' : label}
      </Button>
      {problem && <Notice tone="error">{problem}</Notice>}
    </div>
  );
}
