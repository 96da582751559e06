// The height that lets an element end at the bottom of the window, above the message bar, so a
// plot fills the screen without pushing anything out of view: clamped to [min, max]. Returns a
// callback ref for the element that the plot sits in, and the height to give the plot.
import { useCallback, useLayoutEffect, useState } from 'react';

export function useFitHeight(min: number, max: number, below = 16): [(el: HTMLElement | null) => void, number] {
  const [el, setEl] = useState<HTMLElement | null>(null);
  const [height, setHeight] = useState(min);
  const ref = useCallback((node: HTMLElement | null) => setEl(node), []);
  useLayoutEffect(() => {
    if (!el) return;
    const measure = () => {
      const root = getComputedStyle(document.documentElement);
      const bar = parseFloat(root.getPropertyValue('--toast-bar')) * parseFloat(root.fontSize) || 44;
      const top = el.getBoundingClientRect().top + window.scrollY;
      setHeight(Math.round(Math.max(min, Math.min(max, window.innerHeight - bar - below - top))));
    };
    measure();
    window.addEventListener('resize', measure);
    // What sits above the element grows as data arrives (the flag reasons, a banner): measure again.
    const observer = new ResizeObserver(measure);
    const page = el.closest('[data-fit-root]') ?? document.body;
    observer.observe(page);
    return () => {
      window.removeEventListener('resize', measure);
      observer.disconnect();
    };
  }, [el, min, max, below]);
  return [ref, height];
}
