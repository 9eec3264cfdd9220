// Map tooltips show names from uploaded files and people's input as text: an import-report label
// or a shelter name written as HTML must not become markup in the map (Leaflet inserts string
// tooltip content as HTML). Checked on a real Leaflet map in happy-dom.
import { describe, expect, it } from 'vitest';
import { L } from '../../src/map/leaflet';
import { bindTextTooltip, escapeHtml } from '../../src/map/text-tooltip';

const hostile = ['<img src=x onerror="window.__hit=1">', 'Shelter <b>North</b> & "Hall"', "<script>alert('x')</script>", 'Mill Rd > Quay St'];

describe('text tooltips', () => {
  it('escape every character HTML gives meaning to', () => {
    expect(escapeHtml(`<a href="x" title='y'>&</a>`)).toBe('&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;&lt;/a&gt;');
  });

  it('show hostile names as text on a Leaflet map, creating no element', () => {
    const div = document.createElement('div');
    div.style.width = '400px';
    div.style.height = '300px';
    document.body.appendChild(div);
    const map = L.map(div).setView([44.5, -38], 14);
    for (const name of hostile) {
      const marker = bindTextTooltip(L.circleMarker([44.5, -38]), name, { permanent: true }).addTo(map);
      marker.openTooltip();
      const content = marker.getTooltip()!.getElement()!;
      expect(content.textContent).toBe(name);
      expect(content.querySelector('img, b, script')).toBeNull();
      marker.remove();
    }
    expect((window as unknown as { __hit?: number }).__hit).toBeUndefined();
    map.remove();
  });
});
