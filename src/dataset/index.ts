/** The dataset layer: field lists, the manifest, and the dataset files. Re-exports only. */
export {
  FLAG_CODES,
  FRAME_FIELDS,
  TOSS_FIELDS,
  fieldDescription,
  fieldLabel,
  type CellValue,
  type Field,
  type FieldType,
  type FlagCode,
  type FlagSeverity,
  type FrameFieldName,
  type FrameRow,
  type TossFieldName,
  type TossRow,
} from './fields.ts';
export { DatasetError, canonicalValue } from './cell.ts';
export { ManifestError, ManifestRowSchema, parseManifest, readManifest, type Manifest, type ManifestRow } from './manifest.ts';
export { atomicWriteFile } from './atomicWriteFile.ts';
export { canonicalRows, writeDataset, type DatasetContent } from './write.ts';
export { readFrames, readTosses } from './read.ts';
export { dataPackage, tableSchema, type TableSchemaField } from './dataPackage.ts';
