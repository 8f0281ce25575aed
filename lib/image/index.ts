export { decodePhoto, decodeRawOnly, MAX_PIXELS, type DecodedPhoto, type DecodeOptions } from './decode';
export { readExposureTags } from './exif';
export { refuseUnsupported } from './sniff';
export { renderArtifacts, writeArtifacts, type Artifacts } from './artifacts';
export { analyzeFiles, type AnalyzeFilesOptions, type FileAnalysis, type PhotoSource, type RoleSource } from './analyze-files';
