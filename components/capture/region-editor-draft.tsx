'use client';

import { createContext, useCallback, useContext, useMemo, useRef, useState, type ReactNode } from 'react';

/** The outcome of saving the editor's unsaved regions: saved (or nothing to save), or why not. */
export type FlushResult = { ok: true; saved: boolean } | { ok: false; message: string };

type RegionDraft = {
  /** Whether the editor holds edits the server does not have yet (drawn, moved or typed). */
  unsaved: boolean;
  /** Saves those edits (nothing when there are none); resolves once the server has them or refused them. */
  flush: () => Promise<FlushResult>;
  /** The editor's side: its save function and whether it has unsaved edits. */
  register: (flush: (() => Promise<FlushResult>) | null) => void;
  setUnsaved: (unsaved: boolean) => void;
};

const Ctx = createContext<RegionDraft | null>(null);

/**
 * Lets the page's Analyse button reach the region editor's unsaved edits, so an analysis never
 * runs on the saved regions while the photo shows other ones.
 */
export function RegionDraftProvider({ children }: { children: ReactNode }) {
  const saver = useRef<(() => Promise<FlushResult>) | null>(null);
  const [unsaved, setUnsaved] = useState(false);
  const register = useCallback((f: (() => Promise<FlushResult>) | null) => {
    saver.current = f;
  }, []);
  const flush = useCallback(async (): Promise<FlushResult> => (saver.current ? saver.current() : { ok: true, saved: false }), []);
  const value = useMemo(() => ({ unsaved, flush, register, setUnsaved }), [unsaved, flush, register]);
  return <Ctx.Provider value={value}>{children}</Ctx.Provider>;
}

/** The page's region draft, or null outside a RegionDraftProvider (nothing to save then). */
export function useRegionDraft(): RegionDraft | null {
  return useContext(Ctx);
}
