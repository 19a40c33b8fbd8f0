/**
 * Runs in the page (read as text by page-watch.ts and evaluated there): lists text that does not
 * fit at the current width. See findOverflowingText.
 */
(() => {
  const problems = [];
  const viewportWidth = document.documentElement.clientWidth;
  const describe = (element) => {
    const parts = [];
    let current = element;
    while (current && parts.length < 4) {
      const testId = current.getAttribute('data-testid');
      const classes = [...current.classList].filter((name) => !name.startsWith('ng-') && !name.startsWith('mdc-')).slice(0, 2);
      parts.unshift(
        `${current.tagName.toLowerCase()}${testId ? `[data-testid=${testId}]` : ''}${classes.map((name) => `.${name}`).join('')}`,
      );
      current = current.parentElement;
    }
    return parts.join(' > ');
  };
  if (document.documentElement.scrollWidth > viewportWidth + 1) {
    problems.push({
      text: '',
      where: 'page',
      how: `the page is ${document.documentElement.scrollWidth} px wide in a ${viewportWidth} px window`,
    });
  }
  const skipped = (element) =>
    element.closest('.leaflet-container, canvas, .cdk-visually-hidden, .app-visually-hidden, [aria-hidden="true"]') !== null;
  for (const element of document.body.querySelectorAll('*')) {
    if (skipped(element)) continue;
    const style = getComputedStyle(element);
    if (style.display === 'none' || style.visibility === 'hidden') continue;
    const ownText = [...element.childNodes]
      .filter((node) => node.nodeType === Node.TEXT_NODE)
      .map((node) => node.textContent ?? '')
      .join('')
      .trim();
    const clipsX = style.overflowX === 'hidden' || style.overflowX === 'clip';
    const scrollsX = style.overflowX === 'auto' || style.overflowX === 'scroll';
    if (scrollsX && element.scrollWidth > element.clientWidth + 1 && !element.closest('.app-table-frame')) {
      problems.push({
        text: (element.textContent ?? '').trim().slice(0, 60),
        where: describe(element),
        how: 'scrolls sideways without showing that it does',
      });
    }
    if (!ownText) continue;
    if ((clipsX || style.textOverflow === 'ellipsis') && element.scrollWidth > element.clientWidth + 1) {
      problems.push({
        text: ownText.slice(0, 80),
        where: describe(element),
        how: `cut off (${element.scrollWidth} px of text in ${element.clientWidth} px)`,
      });
      continue;
    }
    const range = document.createRange();
    range.selectNodeContents(element);
    const rect = range.getBoundingClientRect();
    if (rect.width === 0 || element.closest('.app-table-frame')) continue;
    if (rect.right > viewportWidth + 1) {
      problems.push({
        text: ownText.slice(0, 80),
        where: describe(element),
        how: `runs past the window's right edge (${Math.round(rect.right)} px of ${viewportWidth} px)`,
      });
      continue;
    }
    // Text cut by an ancestor that hides what overflows it (a card, a table container).
    for (let ancestor = element.parentElement; ancestor && ancestor !== document.body; ancestor = ancestor.parentElement) {
      const overflowX = getComputedStyle(ancestor).overflowX;
      if (overflowX === 'visible') continue;
      const box = ancestor.getBoundingClientRect();
      if (overflowX !== 'auto' && overflowX !== 'scroll' && rect.right > box.right + 1) {
        problems.push({
          text: ownText.slice(0, 80),
          where: describe(element),
          how: `cut off by ${describe(ancestor)} (${Math.round(rect.right - box.right)} px hidden)`,
        });
      }
      break;
    }
  }
  return problems;
})();
