import type { RouteRecordRaw } from 'vue-router';
import type { Capability } from '@shared/roles';

/**
 * The menu is data: each area of product.md that exists, its route, icon and the
 * capability needed to see it. The router guard and the menu both read this list.
 */
export interface Area {
  key: string;
  label: string;
  icon: string;
  path: string;
  capability?: Capability;
  routes: RouteRecordRaw[];
}

export const areas: Area[] = [
  {
    key: 'today',
    label: 'Today',
    icon: 'pi pi-sun',
    path: '/today',
    routes: [{ path: 'today', name: 'today', component: () => import('@/views/today/TodayView.vue') }],
  },
  {
    key: 'bench',
    label: 'Bench',
    icon: 'pi pi-book',
    path: '/bench',
    capability: 'samples.read',
    routes: [
      { path: 'bench', name: 'bench', component: () => import('@/views/bench/BenchView.vue') },
      { path: 'bench/samples/:id', name: 'sample', component: () => import('@/views/bench/SampleView.vue'), props: true },
      { path: 'bench/titrations/:id/curve', name: 'curve', component: () => import('@/views/bench/CurveView.vue'), props: true },
    ],
  },
  {
    key: 'lab',
    label: 'Lab QC',
    icon: 'pi pi-sliders-h',
    path: '/lab',
    capability: 'lab.qc.read',
    routes: [
      { path: 'lab', redirect: '/lab/titrants' },
      { path: 'lab/titrants', name: 'lab-titrants', component: () => import('@/views/lab/TitrantsView.vue'), meta: { capability: 'lab.qc.read' } },
      { path: 'lab/calibrations', name: 'lab-calibrations', component: () => import('@/views/lab/CalibrationsView.vue'), meta: { capability: 'lab.qc.read' } },
      { path: 'lab/qc-batches', name: 'lab-qc-batches', component: () => import('@/views/lab/QcBatchesView.vue'), meta: { capability: 'lab.qc.read' } },
    ],
  },
  {
    key: 'review',
    label: 'Review',
    icon: 'pi pi-check-square',
    path: '/review',
    capability: 'titrations.approve',
    routes: [{ path: 'review', name: 'review', component: () => import('@/views/review/ReviewView.vue') }],
  },
  {
    key: 'sites',
    label: 'Sites',
    icon: 'pi pi-map-marker',
    path: '/sites',
    capability: 'sites.read',
    routes: [
      { path: 'sites', name: 'sites', component: () => import('@/views/sites/SitesView.vue') },
      { path: 'sites/facilities/:id', name: 'facility', component: () => import('@/views/sites/FacilityView.vue'), props: true },
    ],
  },
  {
    key: 'permits',
    label: 'Permits',
    icon: 'pi pi-file',
    path: '/permits',
    capability: 'permits.read',
    routes: [
      { path: 'permits', name: 'permits', component: () => import('@/views/permits/PermitsView.vue') },
      { path: 'permits/:id', name: 'permit', component: () => import('@/views/permits/PermitView.vue'), props: true },
    ],
  },
  {
    key: 'compliance',
    label: 'Compliance',
    icon: 'pi pi-shield',
    path: '/compliance',
    capability: 'compliance.read',
    routes: [{ path: 'compliance', name: 'compliance', component: () => import('@/views/compliance/ComplianceView.vue') }],
  },
  {
    key: 'reports',
    label: 'Reports',
    icon: 'pi pi-file-pdf',
    path: '/reports',
    capability: 'reports.read',
    routes: [
      { path: 'reports', name: 'reports', component: () => import('@/views/reports/ReportsView.vue') },
      { path: 'reports/:id', name: 'report', component: () => import('@/views/reports/ReportView.vue'), props: true },
    ],
  },
  {
    key: 'billing',
    label: 'Billing',
    icon: 'pi pi-wallet',
    path: '/billing',
    capability: 'billing.read',
    routes: [
      { path: 'billing', name: 'billing', component: () => import('@/views/billing/BillingView.vue') },
      { path: 'billing/prices', name: 'billing-prices', component: () => import('@/views/billing/PricesView.vue') },
      { path: 'billing/invoices/:id', name: 'invoice', component: () => import('@/views/billing/InvoiceView.vue'), props: true },
    ],
  },
  {
    key: 'tools',
    label: 'Tools',
    icon: 'pi pi-calculator',
    path: '/tools',
    capability: 'calc.use',
    routes: [
      { path: 'tools', name: 'tools', component: () => import('@/views/tools/ToolsView.vue') },
      { path: 'tools/titration', name: 'tool-titration', component: () => import('@/views/tools/TitrationCalculatorView.vue') },
      { path: 'tools/corrosion', name: 'tool-corrosion', component: () => import('@/views/tools/CorrosionIndicesView.vue') },
      { path: 'tools/enhanced-coagulation', name: 'tool-enhanced-coagulation', component: () => import('@/views/tools/EnhancedCoagulationView.vue') },
      { path: 'tools/nitrification', name: 'tool-nitrification', component: () => import('@/views/tools/NitrificationBudgetView.vue') },
      { path: 'tools/alkalinity-dose', name: 'tool-alkalinity-dose', component: () => import('@/views/tools/AlkalinityDoseView.vue') },
      { path: 'tools/digester', name: 'tool-digester', component: () => import('@/views/tools/DigesterHealthView.vue') },
      { path: 'tools/curve-insight', name: 'tool-curve-insight', component: () => import('@/views/tools/CurveInsightView.vue') },
    ],
  },
  {
    key: 'admin',
    label: 'Admin',
    icon: 'pi pi-cog',
    path: '/admin',
    capability: 'audit.read',
    routes: [
      { path: 'admin', redirect: '/admin/users' },
      { path: 'admin/users', name: 'admin-users', component: () => import('@/views/admin/UsersView.vue'), meta: { capability: 'users.manage' } },
      { path: 'admin/audit', name: 'admin-audit', component: () => import('@/views/admin/AuditView.vue'), meta: { capability: 'audit.read' } },
    ],
  },
];
