import { describe, expect, it } from 'vitest';
import { VIDEO_ERROR_CODES, VideoError, isVideoError } from '../../src/video/errors.ts';

describe('VideoError', () => {
  it('reads `clip "<file>": <problem>` and carries file, code, problem and stderr tail', () => {
    const err = new VideoError('a b.mp4', 'not_video', 'not a video (ffprobe found no video stream)', { stderrTail: 'x' });
    expect(err.message).toBe('clip "a b.mp4": not a video (ffprobe found no video stream)');
    expect(err).toBeInstanceOf(Error);
    expect(err.name).toBe('VideoError');
    expect([err.file, err.code, err.problem, err.stderrTail]).toEqual(['a b.mp4', 'not_video', 'not a video (ffprobe found no video stream)', 'x']);
  });

  it('quotes a name holding quotes or backslashes unambiguously', () => {
    expect(new VideoError('say "hi"\\.mp4', 'missing', 'no such file').message).toBe('clip "say \\"hi\\"\\\\.mp4": no such file');
  });

  it('isVideoError tells the class and, optionally, the code', () => {
    const err = new VideoError('x', 'timeout', 'too slow');
    expect(isVideoError(err)).toBe(true);
    expect(isVideoError(err, 'timeout')).toBe(true);
    expect(isVideoError(err, 'missing')).toBe(false);
    expect(isVideoError(new Error('x'))).toBe(false);
  });

  it('lists the seven codes of the contract', () => {
    expect([...VIDEO_ERROR_CODES].sort()).toEqual(['ffmpeg_failed', 'missing', 'no_frames', 'not_video', 'timeout', 'truncated', 'unreadable']);
  });
});
