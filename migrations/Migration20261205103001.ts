import { Migration } from '@mikro-orm/migrations';

export class Migration20261205103001 extends Migration {

  override async up(): Promise<void> {
    // A task's impact-noise peak and the rating of the protector issued for it (both optional).
    this.addSql(`alter table "safety_ppe_requirement" add column "peak_db_c" double precision null, add column "protector_nrr" double precision null;`);
    // Used oil's viscosity is judged against the oil's own new-oil value, not the grade's band.
    this.addSql(`alter table "oil_target" add column "baseline_viscosity_cst" double precision null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "oil_target" drop column "baseline_viscosity_cst";`);
    this.addSql(`alter table "safety_ppe_requirement" drop column "peak_db_c", drop column "protector_nrr";`);
  }

}
