/** Entry of the editor page: start the controller (restores autosave or opens the demo) and render. */
import { createRoot } from 'react-dom/client';
import { App } from './App';
import { EditorController } from './controller';
import './styles.css';

const controller = new EditorController();
(window as unknown as { haloweave: EditorController }).haloweave = controller;
createRoot(document.getElementById('root')!).render(<App controller={controller} />);
void controller.boot();
