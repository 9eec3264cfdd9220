// Small helpers shared by the map and the chart: SVG strings with escaped text and short numbers.

export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c]!);
}

/** Coordinates to two decimals: enough for print, and keeps the SVG small. */
export function n(value: number): string {
  return (Math.round(value * 100) / 100).toString();
}

export type TextOptions = {
  size: number;
  fill: string;
  anchor?: 'start' | 'middle' | 'end';
  weight?: 'normal' | 'bold';
  /**
   * A white box behind the label, so it stays legible over lines and fills. (An outline halo
   * leaves gaps between words where lines show through.) The width is estimated from the
   * character count, as SVG here has no text metrics: Roboto averages a little over half an em a character.
   */
  halo?: boolean;
};

export function estimatedTextWidth(text: string, size: number, bold = false): number {
  return text.length * size * (bold ? 0.55 : 0.52);
}

export function svgText(x: number, y: number, text: string, o: TextOptions): string {
  const common = `x="${n(x)}" y="${n(y)}" font-family="Roboto" font-size="${o.size}" text-anchor="${o.anchor ?? 'start'}" font-weight="${o.weight ?? 'normal'}"`;
  const body = escapeXml(text);
  let halo = '';
  if (o.halo) {
    const w = estimatedTextWidth(text, o.size, o.weight === 'bold') + 4;
    const anchor = o.anchor ?? 'start';
    const x0 = anchor === 'start' ? x - 2 : anchor === 'middle' ? x - w / 2 : x - w + 2;
    halo = `<rect x="${n(x0)}" y="${n(y - o.size * 0.86)}" width="${n(w)}" height="${n(o.size * 1.18)}" rx="1.5" fill="#ffffff" fill-opacity="0.88"/>`;
  }
  return `${halo}<text ${common} fill="${o.fill}">${body}</text>`;
}

export function polylinePoints(points: readonly (readonly [number, number])[]): string {
  return points.map(([x, y]) => `${n(x)},${n(y)}`).join(' ');
}
