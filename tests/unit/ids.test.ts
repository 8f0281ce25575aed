import { describe, expect, it } from 'vitest';
import { toErrorResponse } from '../../lib/errors';
import { idOr404 } from '../../lib/ids';

describe('idOr404', () => {
  it('gives the id as the lowercase uuid the database stores', () => {
    expect(idOr404('0F8FAD5B-D9CB-469F-A165-70867728950E', 'project')).toBe('0f8fad5b-d9cb-469f-a165-70867728950e');
    expect(idOr404('0f8fad5b-d9cb-469f-a165-70867728950e', 'project')).toBe('0f8fad5b-d9cb-469f-a165-70867728950e');
  });

  it('answers a malformed id with the 404 another lab’s id gets, naming what was asked for', () => {
    for (const raw of ['', 'abc', '0f8fad5b-d9cb-469f-a165-70867728950', "1' or '1'='1"]) {
      const err = (() => {
        try {
          idOr404(raw, 'capture set');
        } catch (e) {
          return e;
        }
      })();
      const { status, body } = toErrorResponse(err);
      expect(status).toBe(404);
      expect(body.error.message).toBe('No such capture set');
    }
  });
});
