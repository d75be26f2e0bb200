// Autosave of the spec being edited: a save a moment after the last edit (PUT …/spec with the
// revision the page last saw), one save at a time, and every outcome in words — saved, saving,
// waiting, failed (with the server's field messages), or a conflict when the groom was saved from
// somewhere else in the meantime. No timers of its own beyond the one delay; no React.
import type { GroomSpec } from '@/lib/groom/spec/spec';
import type { FieldErrors } from '@/lib/http/field-errors';
import type { ApiOutcome } from '@/lib/http/client';

export type SaveStatus =
  | { readonly state: 'saved'; readonly revision: number; readonly savedAt: string | null }
  | { readonly state: 'waiting'; readonly revision: number }
  | { readonly state: 'saving'; readonly revision: number }
  | { readonly state: 'failed'; readonly revision: number; readonly message: string; readonly fields?: FieldErrors }
  | { readonly state: 'conflict'; readonly revision: number; readonly serverRevision: number | null; readonly message: string };

export interface AutosaveOptions {
  readonly save: (spec: GroomSpec, baseRevision: number) => Promise<ApiOutcome<{ revision: number; savedAt: string }>>;
  readonly onStatus: (status: SaveStatus) => void;
  /** Milliseconds after the last edit before saving. */
  readonly delay?: number;
  readonly setTimer?: (run: () => void, ms: number) => unknown;
  readonly clearTimer?: (timer: unknown) => void;
}

export class Autosaver {
  private saved: GroomSpec;
  private latest: GroomSpec;
  private revision: number;
  private timer: unknown = null;
  /** Save even though the spec equals the last saved one (to write it over another copy). */
  private force = false;
  private inFlight: Promise<void> | null = null;
  private status: SaveStatus;
  private readonly delay: number;
  private readonly setTimer: (run: () => void, ms: number) => unknown;
  private readonly clearTimer: (timer: unknown) => void;

  constructor(spec: GroomSpec, revision: number, private readonly options: AutosaveOptions) {
    this.saved = spec;
    this.latest = spec;
    this.revision = revision;
    this.delay = options.delay ?? 800;
    this.setTimer = options.setTimer ?? ((run, ms) => setTimeout(run, ms));
    this.clearTimer = options.clearTimer ?? ((timer) => clearTimeout(timer as ReturnType<typeof setTimeout>));
    this.status = { state: 'saved', revision, savedAt: null };
  }

  get current(): SaveStatus {
    return this.status;
  }

  get savedRevision(): number {
    return this.revision;
  }

  /** True when the latest spec is not yet known to be saved. */
  get dirty(): boolean {
    return this.force || !sameSpec(this.latest, this.saved);
  }

  private set(status: SaveStatus) {
    this.status = status;
    this.options.onStatus(status);
  }

  /** The editor's spec changed: save it after the delay (unless a conflict waits for a decision). */
  update(spec: GroomSpec): void {
    this.latest = spec;
    if (this.status.state === 'conflict') return;
    if (!this.dirty) {
      this.cancelTimer();
      if (!this.inFlight && this.status.state !== 'saved') this.set({ state: 'saved', revision: this.revision, savedAt: null });
      return;
    }
    this.cancelTimer();
    if (!this.inFlight) this.set({ state: 'waiting', revision: this.revision });
    this.timer = this.setTimer(() => {
      this.timer = null;
      void this.saveNow();
    }, this.delay);
  }

  private cancelTimer() {
    if (this.timer !== null) this.clearTimer(this.timer);
    this.timer = null;
  }

  /**
   * Saves now if anything is unsaved and waits for it. Resolves true when the latest spec is
   * saved (the caller may then rely on the server's copy — for a version or an export).
   */
  async flush(): Promise<boolean> {
    this.cancelTimer();
    while (this.inFlight) await this.inFlight;
    if (this.status.state === 'conflict') return false;
    if (this.dirty) await this.saveNow();
    while (this.inFlight) await this.inFlight;
    return !this.dirty && this.status.state === 'saved';
  }

  private saveNow(): Promise<void> {
    if (this.inFlight) return this.inFlight;
    if (!this.dirty || this.status.state === 'conflict') return Promise.resolve();
    const spec = this.latest;
    this.set({ state: 'saving', revision: this.revision });
    this.inFlight = (async () => {
      const outcome = await this.options.save(spec, this.revision);
      this.inFlight = null;
      if (outcome.ok) {
        this.saved = spec;
        this.force = false;
        this.revision = outcome.data.revision;
        if (this.dirty) {
          this.set({ state: 'waiting', revision: this.revision });
          this.timer ??= this.setTimer(() => {
            this.timer = null;
            void this.saveNow();
          }, this.delay);
        } else {
          this.set({ state: 'saved', revision: this.revision, savedAt: outcome.data.savedAt });
        }
        return;
      }
      const error = outcome.error;
      if (error.code === 'stale-revision' || error.status === 409) {
        const serverRevision = typeof error.details?.revision === 'number' ? error.details.revision : null;
        this.set({
          state: 'conflict',
          revision: this.revision,
          serverRevision,
          message: 'This groom was saved from somewhere else (another tab or another person) since this page loaded it, so your latest changes were not saved over it.',
        });
        return;
      }
      this.set({ state: 'failed', revision: this.revision, message: `Not saved: ${error.message}`, ...(error.fields ? { fields: error.fields } : {}) });
    })();
    return this.inFlight;
  }

  /** Tries the failed save again. */
  retry(): Promise<boolean> {
    if (this.status.state === 'failed') this.set({ state: 'waiting', revision: this.revision });
    return this.flush();
  }

  /**
   * Settles a conflict by saving this page's spec over the server's copy: based on the server's
   * revision when the conflict named it, otherwise on `serverRevision`.
   */
  keepMine(serverRevision?: number): Promise<boolean> {
    if (this.status.state !== 'conflict') return this.flush();
    const base = serverRevision ?? this.status.serverRevision;
    if (base === null) return Promise.resolve(false);
    this.revision = base;
    this.force = true;
    this.set({ state: 'waiting', revision: base });
    return this.flush();
  }

  /** The server's copy became the editor's (after a restore, or when the other copy was taken): nothing to save. */
  adopt(spec: GroomSpec, revision: number, savedAt: string | null = null): void {
    this.cancelTimer();
    this.force = false;
    this.saved = spec;
    this.latest = spec;
    this.revision = revision;
    this.set({ state: 'saved', revision, savedAt });
  }

  dispose(): void {
    this.cancelTimer();
  }
}

function sameSpec(a: GroomSpec, b: GroomSpec): boolean {
  return a === b || JSON.stringify(a) === JSON.stringify(b);
}
