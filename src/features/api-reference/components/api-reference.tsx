import { ApiReferenceReact } from '@scalar/api-reference-react';
import '@scalar/api-reference-react/style.css';
// The renderer also injects its base theme as an inline <style>, which our CSP refuses: the same theme, as a file.
import '@scalar/themes/style.css';
import './api-reference.css';

// The reference renders GET /api/openapi.json with Scalar's renderer, bundled with the app (this module is its own
// lazy chunk). Everything that would reach outside our origin is off: no web fonts, no telemetry, no request
// proxy, no hosted client, no chat assistant. The app's CSP (script, style, font and connect: 'self') stays as it is.
const configuration = {
  url: '/api/openapi.json',
  theme: 'none' as const,
  layout: 'modern' as const,
  withDefaultFonts: false,
  telemetry: false,
  hideClientButton: true,
  hideTestRequestButton: true,
  hideDarkModeToggle: true,
  forceDarkModeState: 'light' as const,
  hideModels: true,
  showDeveloperTools: 'never' as const,
  documentDownloadType: 'json' as const,
  defaultOpenFirstTag: true,
  operationTitleSource: 'summary' as const,
  mcp: { disabled: true },
  // The renderer's chat assistant talks to its maker's service: not part of Lumenproof.
  agent: { disabled: true },
};

export function ApiReference() {
  return (
    <div className="lp-api-reference min-w-0 overflow-hidden rounded-lg border border-ink-200 bg-white">
      <ApiReferenceReact configuration={configuration} />
    </div>
  );
}
