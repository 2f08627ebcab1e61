import { Global, Module, type DynamicModule } from '@nestjs/common';
import { APP_FILTER } from '@nestjs/core';
import { APP_CONFIG, type AppConfig } from '../config/config';
import { DATABASE, type OpenDatabase } from '../common/database/database.tokens';
import { HttpErrorFilter } from '../common/errors/http-error.filter';
import { AuditModule } from '../modules/audit/audit.module';
import { AuthModule } from '../modules/auth/auth.module';
import { CalculatorsModule } from '../modules/calculators/calculators.module';
import { CircuitModelModule } from '../modules/circuit-model/circuit-model.module';
import { CircuitsModule } from '../modules/circuits/circuits.module';
import { DiagnosisModule } from '../modules/diagnosis/diagnosis.module';
import { FaultTreesModule } from '../modules/fault-trees/fault-trees.module';
import { ProofsModule } from '../modules/proofs/proofs.module';
import { HealthModule } from '../modules/health/health.module';
import { IdentityModule } from '../modules/identity/identity.module';
import { MeasurementsModule } from '../modules/measurements/measurements.module';
import { PagesModule } from '../modules/pages/pages.module';
import { ReferenceGroupsModule } from '../modules/reference-groups/reference-groups.module';
import { RepairOrdersModule } from '../modules/repair-orders/repair-orders.module';
import { RepairsModule } from '../modules/repairs/repairs.module';
import { ReviewsModule } from '../modules/reviews/reviews.module';
import { ShopSettingsModule } from '../modules/shop-settings/shop-settings.module';

/** Configuration and the opened database, available to every module. */
@Global()
@Module({})
class CoreModule {
  static with(config: AppConfig, database: OpenDatabase): DynamicModule {
    return {
      module: CoreModule,
      providers: [
        { provide: APP_CONFIG, useValue: config },
        { provide: DATABASE, useValue: database },
        { provide: APP_FILTER, useClass: HttpErrorFilter },
      ],
      exports: [APP_CONFIG, DATABASE],
    };
  }
}

@Module({})
export class AppModule {
  static with(config: AppConfig, database: OpenDatabase): DynamicModule {
    return {
      module: AppModule,
      imports: [
        CoreModule.with(config, database),
        HealthModule,
        AuthModule,
        AuditModule,
        IdentityModule,
        RepairOrdersModule,
        CircuitsModule,
        ReferenceGroupsModule,
        MeasurementsModule,
        RepairsModule,
        FaultTreesModule,
        DiagnosisModule,
        ReviewsModule,
        ShopSettingsModule,
        ProofsModule,
        CircuitModelModule,
        CalculatorsModule,
        PagesModule,
      ],
    };
  }
}
