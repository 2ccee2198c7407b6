/**
 * A value that follows its source at most once per `ms` (longer when updating it costs the page much),
 * always ending on the latest: what the plots
 * draw from while hundreds of runs become ready one after another (each would otherwise rebuild every
 * plot's series with every run, work that grows with the square of the number of runs).
 */
import { onBeforeUnmount, shallowRef, watch, type Ref } from 'vue';

export function throttled<T>(source: () => T, ms: number | (() => number)): Ref<T> {
  const interval = typeof ms === 'number' ? () => ms : ms;
  const out = shallowRef(source()) as Ref<T>;
  let timer: ReturnType<typeof setTimeout> | undefined;
  let last = 0;
  // what the last update cost the page (the charts' own redraws follow in tasks of their own and are
  // paced by the draw queue): the next one waits at least five times that
  let cost = 0;
  const stop = watch(source, () => {
    if (timer !== undefined) return;
    const wait = Math.max(0, last + Math.max(interval(), 5 * cost) - Date.now());
    const apply = () => {
      timer = undefined;
      last = Date.now();
      out.value = source();
      setTimeout(() => (cost = Date.now() - last), 0);
    };
    // a lone change after a quiet spell (a tick in the run list) shows at once
    if (wait === 0) apply();
    else timer = setTimeout(apply, wait);
  });
  onBeforeUnmount(() => {
    stop();
    if (timer !== undefined) clearTimeout(timer);
  });
  return out;
}
