/** Entry: mount the viewer, then open the autosaved work or the demo. */
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './App.tsx';
import { startup, watchAutosave } from './compute/session.ts';
import './styles.css';

const root = document.getElementById('root');
if (!root) throw new Error('index.html has no #root element');
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
watchAutosave();
void startup();
