/**
 * The patch that turns a page rendered by Astro's container API into the page `astro build`
 * wrote (src/pipeline/page-renderer.ts): only the stylesheet links and built script names may
 * differ; anything else refuses the renderer.
 */
import { describe, expect, it } from 'vitest';
import { learnPatch } from '../../src/pipeline/page-renderer.ts';

const built =
  '<html><head><title>x</title><link rel="stylesheet" href="/b/_astro/site.A1.css"></head>' +
  '<body><p>part</p><script type="module" src="/b/_astro/page.B2.js"></script></body></html>';
const rendered =
  '<html><head><title>x</title></head>' +
  '<body><p>part</p><script type="module" src="/src/pages/parts/[id].astro?astro&type=script&index=0&lang.ts"></script></body></html>';

describe('page renderer patch', () => {
  it('adds the stylesheet links and renames the scripts, and then the pages are identical', () => {
    const patch = learnPatch(rendered, built);
    expect(patch).toEqual({
      styles: '<link rel="stylesheet" href="/b/_astro/site.A1.css">',
      scripts: [['src="/src/pages/parts/[id].astro?astro&type=script&index=0&lang.ts"', 'src="/b/_astro/page.B2.js"']],
    });
  });

  it('refuses pages that differ in anything else, saying where', () => {
    const other = rendered.replace('<p>part</p>', '<p>parts</p>');
    const patch = learnPatch(other, built);
    expect(patch).toHaveProperty('reason');
    expect((patch as { reason: string }).reason).toMatch(/^differs at character \d+/);
  });

  it('refuses pages with a different number of scripts', () => {
    const patch = learnPatch(rendered.replace(/<script.*<\/script>/, ''), built);
    expect(patch).toEqual({ reason: '0 scripts rendered, 1 built' });
  });
});
