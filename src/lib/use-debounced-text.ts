import { useEffect, useRef, useState } from 'react';

/** How long typing must pause before a search is sent (one request per word, not per key). */
export const SEARCH_PAUSE_MS = 300;

/**
 * The text of a search box that applies itself once typing pauses. `value` is the applied search (from the
 * address); the box shows what is being typed and calls `onCommit` after `SEARCH_PAUSE_MS` without a key.
 * When `value` changes from outside (Back, a saved view, a reset) the box follows it. `commit()` applies the
 * text at once (Enter, a search button).
 */
export function useDebouncedText(value: string, onCommit: (text: string) => void, delay = SEARCH_PAUSE_MS) {
  const [text, setText] = useState(value);
  const [seen, setSeen] = useState(value);
  if (value !== seen) {
    setSeen(value);
    setText(value);
  }
  const commitRef = useRef(onCommit);
  useEffect(() => {
    commitRef.current = onCommit;
  });
  useEffect(() => {
    if (text === value) return;
    const timer = setTimeout(() => commitRef.current(text), delay);
    return () => clearTimeout(timer);
  }, [text, value, delay]);
  const commit = () => {
    if (text !== value) commitRef.current(text);
  };
  return { text, setText, commit };
}
