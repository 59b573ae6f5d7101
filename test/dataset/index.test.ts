import { describe, expect, it } from 'vitest';
import * as dataset from '../../src/dataset/index.ts';
import { writeDataset } from '../../src/dataset/write.ts';
import { readManifest } from '../../src/dataset/manifest.ts';

describe('dataset index', () => {
  it('re-exports the public entries of every module, and only re-exports them', () => {
    expect(Object.keys(dataset).sort()).toEqual([
      'DatasetError', 'FLAG_CODES', 'FRAME_FIELDS', 'ManifestError', 'ManifestRowSchema', 'TOSS_FIELDS', 'atomicWriteFile',
      'canonicalRows', 'canonicalValue', 'dataPackage', 'fieldDescription', 'fieldLabel', 'parseManifest', 'readFrames',
      'readManifest', 'readTosses', 'tableSchema', 'writeDataset',
    ]);
    expect(dataset.writeDataset).toBe(writeDataset);
    expect(dataset.readManifest).toBe(readManifest);
  });
});
