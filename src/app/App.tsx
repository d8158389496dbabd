/** The viewer: the 3-D view between the project steps (left) and the results (right), time along the bottom. */
import { useEffect, useState } from 'react';
import { Viewport } from './scene/Viewport.tsx';
import { TopBar } from './ui/TopBar.tsx';
import { SitePanel } from './ui/SitePanel.tsx';
import { SurfacesPanel } from './ui/SurfacesPanel.tsx';
import { ZonesPanel, finishDraftZone } from './ui/ZonesPanel.tsx';
import { WeatherPanel } from './ui/WeatherPanel.tsx';
import { RunPanel } from './ui/RunPanel.tsx';
import { DesignsPanel } from './ui/DesignsPanel.tsx';
import { ResultsPanel } from './ui/ResultsPanel.tsx';
import { TimeBar } from './ui/TimeBar.tsx';
import { AboutBox } from './ui/AboutBox.tsx';
import { NoticeBar } from './ui/NoticeBar.tsx';
import { useViewer } from './state/store.ts';
import { cancelRun, openFiles } from './compute/session.ts';

function isTyping(e: KeyboardEvent): boolean {
  const t = e.target as HTMLElement | null;
  return !!t && (t.tagName === 'INPUT' || t.tagName === 'SELECT' || t.tagName === 'TEXTAREA') && (t as HTMLInputElement).type !== 'range';
}

/** Overlays of the view that are not results: the sun path. */
function ViewOptions() {
  const showSunPath = useViewer((s) => s.showSunPath);
  const showSolstices = useViewer((s) => s.showSolstices);
  const set = useViewer((s) => s.set);
  return (
    <div className="view-options" role="group" aria-label="View overlays">
      <label>
        <input type="checkbox" checked={showSunPath} onChange={(e) => set({ showSunPath: e.target.checked })} /> Sun path
      </label>
      <label>
        <input type="checkbox" checked={showSolstices} disabled={!showSunPath} onChange={(e) => set({ showSolstices: e.target.checked })} /> with solstices
      </label>
    </div>
  );
}

function ToolHint() {
  const tool = useViewer((s) => s.tool);
  if (tool === 'look') return null;
  return (
    <div className="tool-hint" role="status">
      {tool === 'drawZone'
        ? 'Drawing a zone: click corners on a floor or roof · Enter finishes · Esc cancels'
        : tool === 'editZone'
          ? 'Editing a zone: click a corner handle, then click where it goes · Esc ends'
          : tool === 'placeDevice'
            ? 'Placing a device: click the ground, a floor or a wall · Esc cancels'
            : 'Click a surface to choose its material · Esc ends'}
    </div>
  );
}

export function App() {
  const [dragging, setDragging] = useState(false);
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const s = useViewer.getState();
      if (e.key === 'Escape') {
        if (s.aboutOpen) return; // the dialog closes itself
        if (s.tool === 'editZone' && s.editCorner && s.editCorner.corner >= 0) s.set({ editCorner: { ...s.editCorner, corner: -1 } });
        else if (s.tool !== 'look') s.set({ tool: 'look', draftZone: [], editCorner: null, placeDevice: null });
        else if (s.run.status === 'running') cancelRun();
        else if (s.picked) s.set({ picked: null });
        return;
      }
      if (isTyping(e)) return;
      if (s.tool === 'drawZone' && e.key === 'Enter') finishDraftZone();
      if (s.tool === 'drawZone' && e.key === 'Backspace') s.set({ draftZone: s.draftZone.slice(0, -1) });
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);
  return (
    <div className="app">
      <TopBar />
      <aside className="left" aria-label="Project">
        <SitePanel />
        <SurfacesPanel />
        <ZonesPanel />
        <WeatherPanel />
        <RunPanel />
        <DesignsPanel />
      </aside>
      <main
        className={`view${dragging ? ' dragging' : ''}`}
        onDragOver={(e) => {
          e.preventDefault();
          setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={(e) => {
          e.preventDefault();
          setDragging(false);
          const files = Array.from(e.dataTransfer.files);
          if (files.length > 0) void openFiles(files);
        }}
      >
        <Viewport />
        <ToolHint />
        <NoticeBar />
        <ViewOptions />
        {dragging && <div className="drop-hint">Drop a .glb, .gltf or .obj model, or a project .json with its model</div>}
      </main>
      <aside className="right" aria-label="Results">
        <ResultsPanel />
      </aside>
      <TimeBar />
      <AboutBox />
    </div>
  );
}
