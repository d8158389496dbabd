/** What Sunfacet is and is not: the cautions every view and report carries (DESIGN §7). */
import { useEffect, useRef } from 'react';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { GLARE_CAUTION } from '../../audit/stages/glare.ts';

export function AboutBox() {
  const open = useViewer((s) => s.aboutOpen);
  const set = useViewer((s) => s.set);
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog ref={ref} className="about" aria-labelledby="about-title" onClose={() => set({ aboutOpen: false })}>
      <h2 id="about-title">About Sunfacet</h2>
      <p>
        Sunfacet screens outdoor rooms — terraces, patios, balconies, plazas — for radiant heat from sunlit and hot surfaces: incident sunlight and
        surface temperatures of façade and ground patches, and mean radiant temperature (MRT) and UTCI where people sit or stand. Everything is computed
        in your browser; nothing is sent anywhere.
      </p>
      <h3>Please read</h3>
      <ul>
        <li>It screens designs; it does not certify them. Results depend on the inputs (model, materials, weather) and on the model assumptions.</li>
        <li>Heat stress can harm people. Follow local heat guidance for events and for people working outdoors.</li>
        <li>Reflected glare that could affect drivers or pilots needs a study by a licensed professional under the local rules.</li>
        <li data-testid="about-glare-caution">Glare: {heavy.results?.glare?.caution ?? GLARE_CAUTION}</li>
        <li>Defer to local codes and licensed practice.</li>
      </ul>
      <p className="small muted">
        Colour scales: viridis and magma (van der Walt &amp; Smith, CC0), cividis (Nuñez, Anderton &amp; Renslow 2018) and, for differences between designs, Moreland's cool-warm diverging map (ISVC 2009). UTCI categories after Bröde et
        al. (2012). The demo scene is invented.
      </p>
      <form method="dialog">
        <button type="submit" autoFocus>Close</button>
      </form>
    </dialog>
  );
}
