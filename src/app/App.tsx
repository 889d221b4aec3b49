import type { AppServices } from './inference/app-services';
import { Workbench } from './views/Workbench';

/** The explorer: everything it needs arrives from the composition root (main.tsx). */
export function App({ services }: { services: AppServices }) {
  return <Workbench services={services} />;
}
