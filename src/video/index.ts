/** The ffmpeg layer: where the programs are, probe, decode, encode, and its one error class. */
export { ffmpegPath, ffprobePath, ffmpegVersion, ffprobeVersion } from './paths.ts';
export { startChild, runChild, defaultTimeoutMs, abortError, lastLines } from './run.ts';
export type { ChildExit, ChildHandle, StartChildOptions, RunChildOptions, RunResult } from './run.ts';
export { checkInputFile, fileUrl } from './inputFile.ts';
export type { InputFile } from './inputFile.ts';
export { probeVideo } from './probe.ts';
export type { VideoInfo, ProbeOptions } from './probe.ts';
export { decodeFrames, bytesPerPixel } from './decode.ts';
export type { DecodedFrame, DecodeOptions, RawPixFmt } from './decode.ts';
export type { BufferReuse } from './frameReader.ts';
export { encodeFrames, X264_PRESETS } from './encode.ts';
export type { EncodeOptions, X264Preset } from './encode.ts';
export { VideoError, isVideoError, VIDEO_ERROR_CODES } from './errors.ts';
export type { VideoErrorCode, VideoErrorOptions } from './errors.ts';
export { probeFrameTimes } from './frameTimes.ts';
export type { FrameTimes } from './frameTimes.ts';
