import { HttpErrorResponse } from '@angular/common/http';
import { describe, expect, it } from 'vitest';
import { ApiError, toApiError } from './api-error';

// The error body shape is the server's own contract (shared/errors.ts ApiErrorBody); HttpErrorResponse
// is Angular's (angular.dev, HttpErrorResponse). Expected values: common practice, no source.
describe('toApiError', () => {
  it('keeps message, details and the current value of a 409', () => {
    const current = { id: 7, code: 'R007', version: 3 };
    const e = toApiError(new HttpErrorResponse({ status: 409, url: '/api/studies/1/runs/7', error: { message: 'Run R007 was changed by someone else', current } }));
    expect(e).toBeInstanceOf(ApiError);
    expect(e.status).toBe(409);
    expect(e.message).toBe('Run R007 was changed by someone else');
    expect(e.current).toEqual(current);
  });

  it('falls back to a message of its own when the body has none, without a current value', () => {
    const e = toApiError(new HttpErrorResponse({ status: 502, url: '/api/studies', error: '<html>Bad gateway</html>' }));
    expect(e.message).toContain('HTTP 502');
    expect(e.current).toBeUndefined();
  });
});
