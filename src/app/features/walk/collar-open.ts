import { ChangeDetectionStrategy, Component, inject, OnInit } from '@angular/core';
import { ActivatedRoute, Router } from '@angular/router';
import { collarIdFromTag } from '../../../../shared/model/collar-tag';

/**
 * Where a collar tag's QR code leads (`/walk/collars/<id>`, e.g. from the phone's own camera app):
 * straight on to the collar's visit screen in today's walk.
 */
@Component({
  selector: 'fw-collar-open',
  template: `<p role="status">Opening the collar…</p>`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarOpen implements OnInit {
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);

  ngOnInit(): void {
    const id = collarIdFromTag(this.route.snapshot.paramMap.get('id') ?? '');
    void this.router.navigate(id ? ['/walk/visit', id] : ['/walk'], { replaceUrl: true });
  }
}
