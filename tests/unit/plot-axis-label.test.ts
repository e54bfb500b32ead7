// The plot frame's y-axis label: wrapped at spaces into lines that fit up the side of the plot
// (common practice for axis titles); nothing of the label is dropped.
import { expect, test } from 'vitest';
import { wrapLabel } from '../../components/plot/axisLabel';

const tenPxACharacter = (text: string) => text.length * 10;

test('a y-axis label that fits the plot’s height stays on one line', () => {
  expect(wrapLabel('susceptibility', 200, tenPxACharacter)).toEqual(['susceptibility']);
});

test('a long y-axis label is wrapped at spaces, each line within the room, every word kept in order', () => {
  const label = 'mean-square end-to-end distance of the walk [steps]';
  const lines = wrapLabel(label, 220, tenPxACharacter);
  expect(lines).toEqual(['mean-square end-to-end', 'distance of the walk', '[steps]']);
  for (const line of lines) expect(tenPxACharacter(line)).toBeLessThanOrEqual(220);
  expect(lines.join(' ')).toBe(label);
});

test('past the most lines allowed, the last line takes the rest; a word longer than the room stays whole', () => {
  expect(wrapLabel('a b c d e', 10, tenPxACharacter, 3)).toEqual(['a', 'b', 'c d e']);
  expect(wrapLabel('renormalization-group-time', 100, tenPxACharacter)).toEqual(['renormalization-group-time']);
  expect(wrapLabel('   ', 100, tenPxACharacter)).toEqual([]);
});
