import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { progressCountsText, progressStateHeading } from '../../../../shared/model/progress-state';
import { serverMessage } from '../../core/api/api-error';
import { BoardApi, type Digest, type DigestRoute, type JobState } from './board-api';
import { BoardStore } from './board-store';

/** How often the send job is asked whether the mail went out. */
export const DIGEST_POLL_MS = 1000;
/** Due collar codes listed per route in the preview; the rest are counted (the mail lists them all). */
const CODES_SHOWN = 40;

/**
 * The lead's daily digest on demand: "Send me the digest now" queues the same job the daily
 * schedule uses, addressed to the person asking, and follows it until the mail server took the
 * message; the preview shows what the mail says right now.
 */
@Component({
  selector: 'fw-digest-panel',
  imports: [MatButtonModule],
  template: `
    <section aria-labelledby="digest-heading">
      <h2 id="digest-heading">Daily digest</h2>
      <p>Each lead gets it by e-mail at the site's digest time: what is still due per route, anomalies and silent devices.</p>
      <div class="actions">
        <button mat-flat-button type="button" (click)="send()" [disabled]="sending()">Send me the digest now</button>
        <button mat-stroked-button type="button" (click)="preview()" [disabled]="loading()">Preview digest</button>
      </div>
      <p role="status" aria-live="polite" data-testid="digest-status">{{ status() }}</p>
      <p role="alert" class="problem">{{ problem() }}</p>
      @if (digest(); as d) {
        <article class="preview" data-testid="digest-preview" aria-label="Digest preview">
          <h3>{{ d.site.name }}, {{ d.localDate }} ({{ d.site.timezone }})</h3>
          @for (c of d.campaigns; track c.id) {
            <h4>{{ c.name }} ({{ c.startsOn }} to {{ c.endsOn }})</h4>
            <ul>
              @for (r of c.routes; track r.routeId) {
                <li><strong>{{ r.routeName }}</strong>: {{ counts(r) }}
                  @if (r.due.length) { <br />{{ heading.due }}: {{ codes(r.due) }} }
                  @for (p of r.partial; track p.code) { <br />{{ heading.partial }} {{ p.code }}: still needs {{ p.missing.join(', ') }} }
                </li>
              }
            </ul>
          } @empty { <p>No open campaign: nothing is due.</p> }
          <h4>Worth a look ({{ d.anomalies.total }}, {{ d.anomalies.problems }} to act on)</h4>
          <ul>
            @for (a of d.anomalies.items; track $index) { <li>{{ a.severity === 'problem' ? 'Act: ' : '' }}{{ a.collarCode ? a.collarCode + ': ' : '' }}{{ a.message }}</li> }
            @empty { <li>Nothing unusual found.</li> }
          </ul>
          <h4>Devices silent for a day or more ({{ d.silentDevices.length }})</h4>
          <ul>
            @for (s of d.silentDevices; track s.email) { <li>{{ s.displayName }} ({{ s.email }}){{ s.outboxSize ? ', ' + s.outboxSize + ' not yet synced' : '' }}</li> }
            @empty { <li>Every device has synced within the last day.</li> }
          </ul>
        </article>
      }
    </section>
  `,
  styles: `
    .actions { display: flex; gap: .75rem; flex-wrap: wrap; }
    .preview { border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; padding: .5rem 1rem; max-width: 60rem; }
    .problem { color: var(--mat-sys-error); font-weight: 600; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DigestPanel {
  private readonly api = inject(BoardApi);
  private readonly store = inject(BoardStore);
  protected readonly digest = signal<Digest | null>(null);
  protected readonly sending = signal(false);
  protected readonly loading = signal(false);
  protected readonly status = signal('');
  protected readonly problem = signal('');
  private timer: ReturnType<typeof setTimeout> | null = null;

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      if (this.timer) clearTimeout(this.timer);
    });
  }

  /** The state words of the shared table, as the first word of a line. */
  protected readonly heading = { due: progressStateHeading('due'), partial: progressStateHeading('partial') };

  protected counts(r: DigestRoute): string {
    return progressCountsText({ due: r.due.length, partial: r.partial.length, complete: r.complete, skipped: r.skipped });
  }

  protected codes(due: string[]): string {
    return due.length > CODES_SHOWN ? `${due.slice(0, CODES_SHOWN).join(', ')} and ${due.length - CODES_SHOWN} more` : due.join(', ');
  }

  protected async send(): Promise<void> {
    const site = this.store.site();
    if (!site) return;
    this.sending.set(true);
    this.problem.set('');
    try {
      const { jobId, to } = await this.api.sendDigest(site.id);
      this.status.set(`Digest for ${site.name} is on its way to ${to}…`);
      await this.follow(jobId, to);
    } catch (err) {
      this.problem.set(serverMessage(err, 'The digest could not be sent'));
      this.sending.set(false);
    }
  }

  /** Polls the job until the mail server accepted the message (or the job gave up). */
  private async follow(jobId: string, to: string): Promise<void> {
    const job: JobState = await this.api.job(jobId);
    if (job.state === 'completed') {
      const due = job.result?.['due'];
      this.status.set(`Digest sent to ${to}${typeof due === 'number' ? ` (${due} collar(s) due)` : ''}.`);
      this.sending.set(false);
    } else if (job.state === 'failed') {
      // The queue retries a failed send a few times; say so rather than promise either way.
      this.problem.set(`The digest was not sent yet: ${job.error ?? 'the mail job failed'} (the server tries again a few times).`);
      this.status.set('');
      this.sending.set(false);
    } else {
      this.timer = setTimeout(
        () =>
          void this.follow(jobId, to).catch((err) => {
            this.problem.set(serverMessage(err, 'Could not learn whether the digest went out'));
            this.sending.set(false);
          }),
        DIGEST_POLL_MS,
      );
    }
  }

  protected async preview(): Promise<void> {
    const site = this.store.site();
    if (!site) return;
    this.loading.set(true);
    this.problem.set('');
    try {
      this.digest.set(await this.api.digest(site.id));
    } catch (err) {
      this.problem.set(serverMessage(err, 'The digest preview could not be loaded'));
    } finally {
      this.loading.set(false);
    }
  }
}
