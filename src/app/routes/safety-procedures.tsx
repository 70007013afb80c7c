import { PageTitle } from '../../components/layout/app-shell';

export function Component() {
  return <PageTitle title="Safety" subtitle="This page is being built." />;
}
