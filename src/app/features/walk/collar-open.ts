import { ChangeDetectionStrategy, Component, inject, OnInit } from '@angular/core';
import { ActivatedRoute, Router } from '@angular/router';
import { plannedCode, readCollarTag } from '../../../../shared/model/collar-tag';
import { TagOpener } from './tag-opener';

/**
 * Where a collar tag's QR code leads (`/walk/collars/<id>`, e.g. from the phone's own camera app):
 * straight on to the collar's visit screen in today's walk, or to installing a new collar with
 * this tag when no collar has it yet.
 */
@Component({
  selector: 'fw-collar-open',
  template: `<p role="status">Opening the collar…</p>`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarOpen implements OnInit {
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  private readonly opener = inject(TagOpener);

  ngOnInit(): void {
    const snap = this.route.snapshot;
    const tag = readCollarTag(snap.paramMap.get('id') ?? '');
    if (!tag) {
      void this.router.navigate(['/walk'], { replaceUrl: true });
      return;
    }
    void this.opener.open({ id: tag.id, code: plannedCode(snap.queryParamMap.get('code')) }, { replaceUrl: true });
  }
}
