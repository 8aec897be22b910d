import { formatDuration } from './format-duration';

describe('formatDuration', () => {
  it.each([
    [0, '0 s'],
    [45.9, '45 s'],
    [60, '1 min 0 s'],
    [252, '4 min 12 s'],
    [3600, '1 h 0 min'],
    [7530, '2 h 5 min'],
    [86400, '1 d 0 h'],
    [3 * 86400 + 4 * 3600 + 59, '3 d 4 h'],
    [-5, '0 s'],
  ])('%d s reads "%s"', (seconds, expected) => {
    expect(formatDuration(seconds)).toBe(expected);
  });
});
