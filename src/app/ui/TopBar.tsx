/** The strip along the top: project name, open / save / export, units, about. */
import { useRef } from 'react';
import { useViewer } from '../state/store.ts';
import { setName } from '../state/projectDoc.ts';
import { exportResults, loadDemo, openFiles, saveProject } from '../compute/session.ts';

export function TopBar() {
  const doc = useViewer((s) => s.doc);
  const units = useViewer((s) => s.units);
  const hasResults = useViewer((s) => s.resultsVersion > 0);
  const set = useViewer((s) => s.set);
  const setDoc = useViewer((s) => s.setDoc);
  const input = useRef<HTMLInputElement>(null);
  return (
    <header className="topbar">
      <span className="brand" aria-hidden="true">Sunfacet</span>
      <label className="visually-hidden" htmlFor="project-name">Project name</label>
      <input
        id="project-name"
        className="project-name"
        value={doc?.name ?? ''}
        placeholder="Project name"
        disabled={!doc}
        onChange={(e) => doc && setDoc(setName(doc, e.target.value), { keepResults: true })}
      />
      <span className="spacer" />
      <label className="button" htmlFor="open-files" title="Open a model (.glb, .gltf, .obj) or a project .json (choose it together with its model)">
        Open…
      </label>
      <input
        ref={input}
        id="open-files"
        data-testid="open-files"
        className="visually-hidden"
        type="file"
        multiple
        accept=".glb,.gltf,.obj,.json"
        aria-label="Open a model or a project file"
        onChange={(e) => {
          const files = Array.from(e.target.files ?? []);
          e.target.value = '';
          if (files.length > 0) void openFiles(files);
        }}
      />
      <button type="button" onClick={() => void loadDemo(true)}>Demo</button>
      <button type="button" onClick={saveProject} disabled={!doc}>Save project</button>
      <button type="button" onClick={() => void exportResults()} disabled={!hasResults}>Export results</button>
      <div className="segmented" role="group" aria-label="Units">
        {(['SI', 'IP'] as const).map((u) => (
          <button key={u} type="button" aria-pressed={units === u} onClick={() => set({ units: u })}>
            {u === 'SI' ? '°C · m' : '°F · ft'}
          </button>
        ))}
      </div>
      <button type="button" onClick={() => set({ aboutOpen: true })}>About</button>
    </header>
  );
}
