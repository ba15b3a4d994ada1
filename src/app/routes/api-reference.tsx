import { PageHeader } from '../../components/ui/page-header';
import { ApiReference } from '../../features/api-reference/components/api-reference';

export function ApiReferenceRoute() {
  return (
    <>
      <PageHeader
        title="API reference"
        description={
          <>
            Every route of Lumenproof’s API, its payloads and answers, and the webhooks it sends. The same
            description as a file:{' '}
            <a className="font-medium text-brand-700 underline" href="/api/openapi.json">
              /api/openapi.json
            </a>{' '}
            (OpenAPI 3.1).
          </>
        }
      />
      <ApiReference />
    </>
  );
}
