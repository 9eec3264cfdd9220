// Tooltips whose text comes from people or files (zone and shelter names, import-report labels):
// Leaflet puts a string tooltip in as HTML, so the text is escaped first and shows as written.
import type { Layer, TooltipOptions } from 'leaflet';

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export function bindTextTooltip<T extends Layer>(layer: T, text: string, options?: TooltipOptions): T {
  return layer.bindTooltip(escapeHtml(text), options) as T;
}
