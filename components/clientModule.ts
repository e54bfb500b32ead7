'use client';
// Code fetched in the browser after the page, held as state: null until it has arrived. Unlike
// React.lazy (and next/dynamic), nothing suspends, so React's pause before revealing suspended
// content (300 ms after a fallback is shown, measured on the derivation page) never delays it.
import { useEffect, useState } from 'react';

export interface ClientModule<T> {
  /** Starts fetching (once); pages call it when they know the code will be needed soon. */
  fetch: () => Promise<T>;
  /** The module once it has arrived (null before), and whether fetching it failed. */
  use: () => { module: T | null; failed: boolean };
}

export function clientModule<T>(load: () => Promise<T>): ClientModule<T> {
  let loaded: T | null = null;
  let loading: Promise<T> | null = null;
  const fetch = () => {
    loading ??= load().then((module) => (loaded = module));
    return loading;
  };
  function use() {
    const [module, setModule] = useState<T | null>(loaded);
    const [failed, setFailed] = useState(false);
    useEffect(() => {
      if (module) return;
      let current = true;
      fetch().then(
        (arrived) => current && setModule(() => arrived),
        () => {
          loading = null; // a later visit tries again
          if (current) setFailed(true);
        },
      );
      return () => {
        current = false;
      };
    }, [module]);
    return { module, failed };
  }
  return { fetch, use };
}
