import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { MessageText } from '../../components/checks/MessageText';

describe('a verdict message in the evidence panel', () => {
  it('raises the whole exponent of "eps^3.01" and keeps the caret unseen for copying', () => {
    const html = renderToStaticMarkup(<MessageText message="the residual scales as eps^3.01, expected eps^3" />);
    expect(html).toContain('<sup>3.01</sup>');
    expect(html).toContain('<sup>3</sup>');
    expect(html).not.toMatch(/<sup>3<\/sup>\.01/);
    // What a reader copies is what the solver wrote.
    expect(html.replace(/<[^>]+>/g, '')).toBe('the residual scales as eps^3.01, expected eps^3');
    const grouped = renderToStaticMarkup(<MessageText message="O(x^(k+1)) remains" />);
    expect(grouped).toContain('<sup>k+1</sup>');
    expect(grouped.replace(/<[^>]+>/g, '')).toBe('O(x^(k+1)) remains');
  });

  it('escapes what it shows: a message is text, never markup', () => {
    const html = renderToStaticMarkup(<MessageText message={'<b>x</b>^2'} />);
    expect(html).toContain('&lt;b&gt;x&lt;/b&gt;');
    expect(html).toContain('<sup>2</sup>');
  });
});
