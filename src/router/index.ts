// Named routes; every view but sign-in loads lazily. Guards send signed-out users to sign-in
// and keep pages a role may not use out of reach (the server refuses them anyway).
import { createRouter, createWebHistory } from 'vue-router';
import type { Permission } from '@shared/api/roles';
import { useSessionStore } from '@/stores/session';
import SignInView from '@/views/SignInView.vue';

declare module 'vue-router' {
  interface RouteMeta {
    public?: boolean;
    permission?: Permission;
    title?: string;
    /** The page uses the whole window (the workspace map): the navigation drawer shrinks to icons. */
    fullBleed?: boolean;
  }
}

export const router = createRouter({
  history: createWebHistory(),
  routes: [
    { path: '/', redirect: { name: 'plans' } },
    { path: '/sign-in', name: 'sign-in', component: SignInView, meta: { public: true, title: 'Sign in' } },
    { path: '/plans', name: 'plans', component: () => import('@/views/PlanListView.vue'), meta: { title: 'Plans' } },
    {
      path: '/plans/:planId',
      name: 'plan',
      component: () => import('@/views/PlanWorkspaceView.vue'),
      props: true,
      meta: { title: 'Plan', fullBleed: true },
    },
    { path: '/plans/:planId/scenarios', name: 'scenarios', component: () => import('@/views/ScenarioListView.vue'), props: true, meta: { title: 'Scenarios' } },
    {
      path: '/plans/:planId/scenarios/:scenarioId',
      name: 'scenario',
      component: () => import('@/views/ScenarioEditorView.vue'),
      props: true,
      meta: { title: 'Scenario', fullBleed: true },
    },
    { path: '/plans/:planId/compare', name: 'run-comparison', component: () => import('@/views/RunComparisonView.vue'), props: true, meta: { title: 'Compare runs' } },
    { path: '/plans/:planId/sweeps/:sweepId', name: 'sweep', component: () => import('@/views/SweepView.vue'), props: true, meta: { title: 'Sweep' } },
    { path: '/briefings', name: 'briefings', component: () => import('@/views/BriefingListView.vue'), meta: { title: 'Briefings' } },
    {
      path: '/briefings/:id/review',
      name: 'briefing',
      component: () => import('@/views/BriefingReviewView.vue'),
      props: true,
      meta: { title: 'Briefing', fullBleed: true },
    },
    // Open to anyone holding a briefing PDF, signed in or not.
    { path: '/verify', name: 'verify', component: () => import('@/views/BriefingVerifyView.vue'), meta: { public: true, title: 'Check a briefing' } },
    { path: '/outbox', name: 'outbox', component: () => import('@/views/OutboxView.vue'), meta: { permission: 'users:manage', title: 'Outbox' } },
    {
      path: '/admin/map',
      name: 'map-settings',
      component: () => import('@/views/MapSettingsView.vue'),
      meta: { permission: 'users:manage', title: 'Map settings' },
    },
    {
      path: '/admin/members',
      name: 'members',
      component: () => import('@/views/MemberAdminView.vue'),
      meta: { permission: 'users:manage', title: 'Members' },
    },
    { path: '/account', name: 'account', component: () => import('@/views/AccountView.vue'), meta: { title: 'Your account' } },
    { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { public: true, title: 'Not found' } },
  ],
});

router.beforeEach(async (to) => {
  const session = useSessionStore();
  if (!session.loaded) await session.load().catch(() => undefined);
  if (to.meta.public) return true;
  if (!session.signedIn) return { name: 'sign-in', query: { next: to.fullPath } };
  if (to.meta.permission && !session.allows(to.meta.permission)) return { name: 'plans' };
  return true;
});

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Cutline` : 'Cutline';
});
