import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { LockRegister } from '../../features/safety/components/lock-register';

export function Component() {
  return (
    <>
      <PageTitle
        title="Lock register"
        subtitle="Every personal and isolation-point lock by its number: who holds it, where it is on now and where it has been."
      />
      <Panel>
        <LockRegister />
      </Panel>
    </>
  );
}
