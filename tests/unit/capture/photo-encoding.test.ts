import { describe, expect, it } from 'vitest';
import { captureSetSchema, captureSetUpdateSchema, photoEncoding, type PhotoEncodingFacts } from '../../../lib/schemas/capture-set';

const tiff = (o: Partial<PhotoEncodingFacts> = {}): PhotoEncodingFacts => ({ role: 'on', originalName: 'on.tif', format: 'tiff', bitDepth: 16, encodingFile: 'linear', encodingReason: 'no colour profile', encodingDeclared: null, ...o });
const jpeg = tiff({ originalName: 'on.jpg', format: 'jpeg', bitDepth: 8, encodingFile: 'srgb' });

describe('how a photo is read', () => {
  it('follows the file with "auto": a linear 16-bit TIFF is linear, an sRGB-profiled one is not', () => {
    expect(photoEncoding('auto', tiff())).toEqual({ linear: true, by: 'file', conflict: null });
    expect(photoEncoding('auto', tiff({ encodingFile: 'srgb' })).linear).toBe(false);
    expect(photoEncoding('auto', jpeg).linear).toBe(false);
  });

  it('keeps the old sRGB reading for photos stored before files were asked', () => {
    expect(photoEncoding('auto', tiff({ encodingFile: null }))).toEqual({ linear: false, by: 'file', conflict: null });
  });

  it('lets the set decide over the file, and the photo over the set', () => {
    expect(photoEncoding('srgb', tiff())).toEqual({ linear: false, by: 'set', conflict: null });
    expect(photoEncoding('linear', tiff({ encodingFile: 'srgb' }))).toEqual({ linear: true, by: 'set', conflict: null });
    expect(photoEncoding('srgb', tiff({ encodingDeclared: 'linear' }))).toEqual({ linear: true, by: 'photo', conflict: null });
    expect(photoEncoding('linear', tiff({ encodingDeclared: 'srgb' }))).toEqual({ linear: false, by: 'photo', conflict: null });
  });

  it('says what to do when a set declared linear holds a photo that cannot be', () => {
    const d = photoEncoding('linear', jpeg);
    expect(d.linear).toBe(false);
    expect(d.conflict).toMatch(/declared linear 16-bit, but the on photo on\.jpg is an 8-bit JPEG: upload its 16-bit TIFF/);
    expect(photoEncoding('linear', tiff({ bitDepth: 8 })).conflict).toMatch(/an 8-bit TIFF/);
  });

  it('never reads a photo linear that is not a 16-bit TIFF, whatever was declared', () => {
    expect(photoEncoding('auto', { ...jpeg, encodingDeclared: 'linear' }).linear).toBe(false);
  });
});

describe('the capture set schema', () => {
  it('defaults to "auto" on create; an update carries only the fields it names (no defaults); other values are refused', () => {
    expect(captureSetSchema.parse({ label: 'A' }).tiffEncoding).toBe('auto');
    expect(Object.keys(captureSetUpdateSchema.parse({ label: 'A' }))).toEqual(['label']);
    expect(captureSetUpdateSchema.parse({ tiffEncoding: 'srgb' })).toEqual({ tiffEncoding: 'srgb' });
    expect(captureSetUpdateSchema.safeParse({ pattern: 'stripes' }).success).toBe(false);
    expect(captureSetSchema.parse({ label: 'A', tiffEncoding: 'linear' }).tiffEncoding).toBe('linear');
    expect(captureSetSchema.safeParse({ label: 'A', tiffEncoding: 'gamma' }).success).toBe(false);
  });
});
