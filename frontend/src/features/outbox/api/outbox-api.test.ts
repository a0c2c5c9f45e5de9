import { describe, expect, it } from 'vitest';
import { OUTBOX_FILTERS, outboxListParams } from './outbox-api';

// The outbox filter comes straight from the address bar; anything that is not one of the five
// filters must fall back to "all" rather than reach a lookup table.
describe('outboxListParams', () => {
  it('keeps each known filter', () => {
    for (const f of OUTBOX_FILTERS) expect(outboxListParams(new URLSearchParams({ status: f })).status).toBe(f);
  });

  it.each(['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf', 'SENT', ' sent', ''])('falls back to all for %j', (raw) => {
    expect(outboxListParams(new URLSearchParams({ status: raw })).status).toBe('all');
  });

  it('falls back to page 1 for a page that is not a positive number', () => {
    for (const raw of ['0', '-3', 'abc', '__proto__', '1e400', 'NaN']) expect(outboxListParams(new URLSearchParams({ page: raw })).page).toBe(1);
    expect(outboxListParams(new URLSearchParams({ page: '4' })).page).toBe(4);
  });
});
