import { sameValue } from '../../core/db/record-values';
import { ClosurePanel } from '../closures/closure-panel';
import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { debounceTime } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { profileForClosure } from '../../../../shared/flux/chamber-system';
import { collarAreaCm2, offsetStats } from '../../../../shared/model/derived';
import { siteFields, siteProbeDepth } from '../../../../shared/model/site-layout';
import { siteToday } from '../../../../shared/time/site-time';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { AirTempField } from './air-temp-field';
import { AUTOSAVE_MS, OffsetForm } from './offset-form';
import { nextDueIndex } from './route-order';
import { RouteStore } from './route-store';
import { ProbeForm, type ProbeSave } from './probe-form';
import { SkipForm } from './skip-form';
import { WalkContext } from '../field-day/walk-context';
import { visitView } from './visit-query';
import { InvalidRecordError } from '../../core/db/validated';
import { VisitWrites, type VisitConditions, type VisitTarget } from '../field-day/visit-writes';

const CONDITIONS: { key: keyof Omit<VisitConditions, 'other' | 'airTempC'>; label: string }[] = [
  { key: 'rainNow', label: 'Raining now' },
  { key: 'rain24h', label: 'Rain in the last 24 h' },
  { key: 'standingWater', label: 'Standing water' },
  { key: 'frostSnow', label: 'Frost or snow' },
  { key: 'trampled', label: 'Trampled' },
  { key: 'animal', label: 'Animal disturbance' },
];

type ConditionsForm = FormGroup<{ [K in keyof VisitConditions]: FormControl<VisitConditions[K]> }>;

/** The site's offset limits; the schema's defaults when the site's record is not on the device. */
const offsetLimits = siteFields.pick({ offsetSpreadPct: true, offsetMoveCm: true });

/**
 * One collar in one pass: who it is and what to watch for, then conditions, the offset set and
 * the probes (taken while the chamber runs), the closures; the chamber, its timer and "Next
 * collar" sit in a bar at the bottom of the screen. Every section saves itself to the device as
 * it is filled (no Save buttons), shows what it holds, and folds to one line once done, so the
 * next control is on screen without scrolling; a skip asks for a reason.
 */
@Component({
  selector: 'fw-visit-page',
  imports: [
    SiteTimePipe,
    DecimalPipe,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatInputModule,
    OffsetForm,
    ProbeForm,
    ReactiveFormsModule,
    RouterLink,
    SkipForm,
    ClosurePanel,
    AirTempField,
  ],
  templateUrl: './visit-page.html',
  styleUrl: './walk.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitPage {
  readonly collarId = input.required<string>();
  private readonly walk = inject(WalkContext);
  private readonly writes = inject(VisitWrites);
  protected readonly choice = this.walk.choice;
  protected readonly view = visitView(() => ({
    collarId: this.collarId(),
    campaignId: this.choice().campaignId,
    round: this.choice().round,
  }));
  protected readonly conditionList = CONDITIONS;
  protected readonly conditions: ConditionsForm = new FormGroup({
    rainNow: new FormControl(false, { nonNullable: true }),
    rain24h: new FormControl(false, { nonNullable: true }),
    standingWater: new FormControl(false, { nonNullable: true }),
    frostSnow: new FormControl(false, { nonNullable: true }),
    trampled: new FormControl(false, { nonNullable: true }),
    animal: new FormControl(false, { nonNullable: true }),
    other: new FormControl('', { nonNullable: true }),
    airTempC: new FormControl<number | null>(null),
  });
  protected readonly busy = signal(false);
  protected readonly message = signal('');
  protected readonly problem = signal('');
  /** The crew opened the conditions again after they folded. */
  protected readonly conditionsOpen = signal(false);
  private readonly route = inject(RouteStore).view(() => {
    const c = this.choice();
    return { campaignId: c.campaignId, routeId: c.routeId, round: c.round, flipped: c.flipped };
  });

  constructor() {
    // The stored conditions fill the form when a visit first appears (another visit, or the one the
    // first save made), never while the crew is ticking boxes: only a new visit id passes.
    toObservable(computed(() => this.view()?.visit ?? null, { equal: (a, b) => a?.id === b?.id }))
      .pipe(takeUntilDestroyed())
      .subscribe((v) => {
        // A copy stored before a condition existed lacks it: the form keeps its own value there.
        if (v) this.conditions.setValue({ ...this.conditions.getRawValue(), ...v.conditions }, { emitEvent: false });
      });
    this.conditions.valueChanges
      .pipe(debounceTime(AUTOSAVE_MS), takeUntilDestroyed(inject(DestroyRef)))
      .subscribe(() => void this.saveConditions());
  }

  /** The next collar still due on the route, after this one in walking order (then from the top). */
  protected readonly next = computed(() => {
    const rows = this.route()?.rows ?? [];
    const here = rows.findIndex((r) => r.id === this.collarId());
    const after = [...rows.slice(here + 1), ...rows.slice(0, Math.max(0, here))];
    const i = nextDueIndex(after.map((r) => r.state));
    return i < 0 ? null : { id: after[i].id, code: after[i].code };
  });

  /**
   * Conditions are done once the visit holds them and the crew has saved the next part (offsets
   * or probes), so ticking a second box a moment later never finds the list folded.
   */
  protected readonly conditionsFolded = computed(() => {
    const v = this.view();
    return !!v?.visit && (!!v.offsetSet || !!v.probe) && !this.conditionsOpen();
  });
  protected readonly conditionsText = computed(() => {
    const c = this.view()?.visit?.conditions;
    if (!c) return '';
    const words = CONDITIONS.filter((x) => c[x.key]).map((x) => x.label.toLowerCase());
    if (c.other.trim()) words.push(c.other.trim());
    return words.length ? words.join(', ') : 'nothing special';
  });

  protected readonly target = computed<VisitTarget | null>(() => {
    const v = this.view();
    const c = this.choice();
    if (!v || !c.campaignId) return null;
    return { siteId: v.collar.siteId, campaignId: c.campaignId, round: c.round, collarId: v.collar.id };
  });

  /** The site's probe depth and tolerance (the schema defaults when the stored site copy predates the fields). */
  protected readonly probeDepth = computed(() => {
    const r = siteProbeDepth.safeParse(this.view()?.site ?? {});
    return r.success ? r.data : siteProbeDepth.parse({});
  });
  /** The site's zone: days and times on this screen are the site's (UTC until the site's record is on the device). */
  protected readonly zone = computed(() => this.view()?.site?.timezone ?? 'UTC');

  protected readonly offsetContext = computed(() => {
    const v = this.view();
    if (!v) return null;
    const day = siteToday(this.zone());
    // The crew's own chamber (the one its closures carry), not the newest profile of the site.
    const chamber = profileForClosure(
      v.profiles.map((p) => ({ ...p, areaCm2: 0 })),
      this.choice().profileId,
      day,
      v.site?.defaultProfileId ?? null,
    );
    return {
      day,
      collarAreaCm2: collarAreaCm2(v.collar),
      profiles: chamber.ok ? [chamber.profile] : [],
      thresholds: offsetLimits.parse(v.site ?? {}),
    };
  });

  protected readonly lastReadings = computed(() => this.view()?.lastOffsetSet?.readingsCm ?? null);
  protected readonly lastMean = computed(() => {
    const r = this.lastReadings();
    return r?.length ? offsetStats(r).meanCm : null;
  });
  protected readonly savedReadings = computed(() => this.view()?.offsetSet?.readingsCm ?? null);
  protected readonly kit = computed(() => {
    const c = this.choice();
    return { probeId: c.probeId, rodLengthCm: c.rodLengthCm, moistureKind: c.moistureKind };
  });

  protected saveConditions(): Promise<void> {
    const now = this.conditions.getRawValue();
    const stored = this.view()?.visit?.conditions;
    if (stored && sameValue({ ...now, ...stored }, now)) return Promise.resolve();
    return this.run('Conditions saved on this device.', (t, v) => this.writes.saveConditions(t, v.visit, now));
  }

  protected saveOffsets(readings: number[]): Promise<void> {
    return this.run('Offset set saved on this device.', (t, v) => this.writes.saveOffsetSet(t, v.visit, readings));
  }

  protected saveProbe(p: ProbeSave): Promise<void> {
    return this.run('Probe readings saved on this device.', async (t, v) => {
      await this.writes.saveProbe(t, v.visit, { ...p.reading }, p.id);
      this.walk.update({ probeId: p.reading.probeId, rodLengthCm: p.reading.rodLengthCm, moistureKind: p.reading.moistureKind });
    });
  }

  protected deleteProbe(id: string): Promise<void> {
    return this.run('Replicate deleted on this device.', () => this.writes.deleteProbe(id));
  }

  protected skip(reason: string): Promise<void> {
    return this.run('Collar skipped; the reason goes to the Board with the next sync.', (t, v) => this.writes.skip(t, v.visit, reason));
  }

  protected undoSkip(): Promise<void> {
    return this.run('Skip undone.', async (_t, v) => {
      if (v.visit) await this.writes.unskip(v.visit);
    });
  }

  private async run(done: string, work: (t: VisitTarget, v: NonNullable<ReturnType<typeof this.view>>) => Promise<void>): Promise<void> {
    const t = this.target();
    const v = this.view();
    if (!t || !v) {
      this.problem.set('Pick a campaign and round on the route screen first.');
      return;
    }
    this.busy.set(true);
    this.problem.set('');
    this.message.set('');
    try {
      await work(t, v);
      this.message.set(done);
    } catch (err) {
      this.problem.set(err instanceof InvalidRecordError || err instanceof Error ? err.message : 'Could not save on this device');
    } finally {
      this.busy.set(false);
    }
  }
}
