import { useEffect, useRef, useState } from 'react';

/**
 * True once the element has come near the viewport (and from then on): parts below the fold do
 * their heavy work — loading a chart library, rerunning the engine — only when the camper scrolls
 * to them. `force` turns it on at once (printing wants everything).
 */
export function useSeen<T extends Element>(force = false, rootMargin = '300px'): { ref: React.RefObject<T | null>; seen: boolean } {
  const ref = useRef<T | null>(null);
  const [seen, setSeen] = useState(false);
  useEffect(() => {
    if (seen) return;
    if (force || typeof IntersectionObserver === 'undefined') {
      setSeen(true);
      return;
    }
    const el = ref.current;
    if (!el) return;
    const io = new IntersectionObserver((entries) => {
      if (entries.some((e) => e.isIntersecting)) setSeen(true);
    }, { rootMargin });
    io.observe(el);
    return () => io.disconnect();
  }, [seen, force, rootMargin]);
  return { ref, seen: seen || force };
}
