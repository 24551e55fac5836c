import { type Signal, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { ActivatedRoute } from '@angular/router';
import { combineLatest, map } from 'rxjs';

/**
 * The study id of the current route. The analysis pages are tabs under /studies/:id, whose :id belongs
 * to the parent route and is not bound to child inputs, so it is read from the route path instead.
 */
export function routeStudyId(): Signal<number> {
  const route = inject(ActivatedRoute);
  const id$ = combineLatest(route.pathFromRoot.map((r) => r.paramMap)).pipe(
    map((maps) => Number(maps.map((m) => m.get('id')).filter((v): v is string => v !== null).pop())),
  );
  return toSignal(id$, { requireSync: true });
}
