// A drawn plot as a standalone SVG file: the chart's own SVG, without the hover decorations,
// on a paper background, with its title, fonts named, and a proper XML header.

const PAPER = '#fbfaf6';
const INK = '#1d1b18';

function escapeXml(text: string): string {
  return text.replace(/[<>&"']/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' })[c]!);
}

/** Serialises the chart's SVG element with a title band above it. */
export function standaloneSvg(svg: SVGSVGElement, title: string): string {
  const width = Math.round(svg.width.baseVal.value || svg.getBoundingClientRect().width);
  const height = Math.round(svg.height.baseVal.value || svg.getBoundingClientRect().height);
  const clone = svg.cloneNode(true) as SVGSVGElement;
  for (const transient of Array.from(clone.querySelectorAll('[data-plot-transient]'))) transient.remove();
  clone.removeAttribute('style');
  clone.removeAttribute('class');
  clone.removeAttribute('tabindex');
  const band = 28;
  const body = new XMLSerializer().serializeToString(clone);
  return [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height + band}" viewBox="0 0 ${width} ${height + band}">`,
    `<title>${escapeXml(title)}</title>`,
    `<style>text { font-family: "EB Garamond", Georgia, serif; }</style>`,
    `<rect x="0" y="0" width="${width}" height="${height + band}" fill="${PAPER}"/>`,
    `<text x="12" y="19" font-size="15" fill="${INK}">${escapeXml(title)}</text>`,
    `<g transform="translate(0 ${band})">${body}</g>`,
    '</svg>',
  ].join('\n');
}

/** A file name from a title: letters, digits and dashes, ending in .svg. */
export function svgFileName(title: string): string {
  const stem = title
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .replace(/\s+/g, '-')
    .toLowerCase()
    .slice(0, 60);
  return `${stem || 'plot'}.svg`;
}

/** Offers the text as a download in the browser. */
export function downloadText(text: string, fileName: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1_000);
}
