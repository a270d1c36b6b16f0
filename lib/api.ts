// The one typed client of Kernwright's HTTP API. Every response is checked against the shared
// zod schema; every failure becomes an ApiError carrying the API's { error: { code, message, details } }.
import { z } from 'zod';
import {
  signInResponseSchema,
  userSchema,
  type SignInRequest,
  type SignInResponse,
  type User,
} from '../shared/api/auth';
import { apiErrorSchema, fieldIssueSchema, type ErrorCode, type FieldIssue } from '../shared/api/errors';
import { healthSchema, type Health } from '../shared/api/health';
import {
  userListSchema,
  type CreateUserRequest,
  type ListUsersQuery,
  type UpdateUserRequest,
  type UserList,
} from '../shared/api/users';
import { disputeItemSchema, inspectionSchema, type DisputeItem, type Inspection } from '../shared/api/inspections';
import { defectKindSchema, partTypeSchema, type DefectKind, type PartType } from '../shared/api/catalogue';
import { kernelInfoSchema, type KernelInfo } from '../shared/api/kernels';
import { previewResultSchema, type PreviewResult } from '../shared/api/preview';
import {
  referenceImagePageSchema,
  referenceImageSchema,
  referenceSetSchema,
  uploadResultSchema,
  type ImageLabel,
  type ReferenceImage,
  type ReferenceSet,
  type UploadOutcome,
} from '../shared/api/references';
import {
  ruleDetailSchema,
  ruleSummarySchema,
  ruleVersionSchema,
  type RuleDetail,
  type RuleSummary,
  type RuleVersion,
  type RuleVersionState,
} from '../shared/api/rules';
import { lineSchema, stationSchema, type CalibrationRequest, type Line, type Station } from '../shared/api/stations';
import { sweepSchema, trialResultSchema, trialSchema, type Sweep, type Trial, type TrialResult } from '../shared/api/trials';
import { recordPageSchema, type RecordPage } from '../shared/api/records';
import { ruleHistorySchema, type RuleHistory } from '../shared/api/rule-history';
import { paretoSchema, pChartSchema, trendChoicesSchema, type Pareto, type PChart, type PChartQuery, type TrendChoices, type TrendFilters } from '../shared/api/trends';
import {
  alertLimitListSchema,
  alertLimitSchema,
  alertPageSchema,
  alertSchema,
  alertSubscriptionSchema,
  type Alert,
  type AlertLimit,
  type AlertPage,
  type AlertSubscription,
  type CreateAlertLimit,
} from '../shared/api/alerts';
import {
  attributeAgreementSchema,
  repeatabilityStudyListSchema,
  repeatabilityStudySchema,
  type AttributeAgreement,
  type AttributeAgreementQuery,
  type CreateRepeatabilityStudy,
  type RepeatabilityStudy,
} from '../shared/api/studies';
import { chainVerificationSchema, type ChainVerificationResult } from '../shared/api/audit';
import { currentToken, endSession } from './session';

/** Codes the client adds for failures that never reached the API's error shape. */
export type ClientErrorCode = 'network_error' | 'unreadable_response';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode | ClientErrorCode | (string & {}),
    message: string,
    readonly fieldIssues: FieldIssue[] = [],
    readonly details: unknown = undefined,
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

// Same origin by default (Express serves the app and the API); a separate dev server can point elsewhere.
const API_BASE_URL = process.env.EXPO_PUBLIC_API_BASE_URL ?? '';

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
type QueryValue = string | number | boolean | undefined;

interface RequestOptions<T> {
  method?: Method;
  body?: unknown;
  query?: Record<string, QueryValue>;
  /** Schema of a successful body; omit for 204 answers. */
  schema?: z.ZodType<T>;
  /** false for sign-in: a 401 there means wrong credentials, not an ended session. */
  authenticated?: boolean;
  signal?: AbortSignal;
}

const fieldIssuesSchema = z.object({ issues: z.array(fieldIssueSchema) });

function buildUrl(path: string, query?: Record<string, QueryValue>): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value !== undefined && value !== '') params.set(key, String(value));
  }
  const search = params.toString();
  return `${API_BASE_URL}${path}${search ? `?${search}` : ''}`;
}

async function readJson(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

function errorFromResponse(status: number, body: unknown): ApiError {
  const parsed = apiErrorSchema.safeParse(body);
  if (!parsed.success) {
    return new ApiError(status, status >= 500 ? 'internal' : 'unreadable_response', `The server answered ${status} without an explanation.`);
  }
  const { code, message, details } = parsed.data.error;
  const issues = fieldIssuesSchema.safeParse(details);
  return new ApiError(status, code, message, issues.success ? issues.data.issues : [], details);
}

async function request<T>(path: string, options: RequestOptions<T> = {}): Promise<T> {
  const { method = 'GET', body, query, schema, authenticated = true, signal } = options;
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (body !== undefined) headers['Content-Type'] = 'application/json';
  const token = authenticated ? currentToken() : null;
  if (token) headers.Authorization = `Bearer ${token}`;

  let response: Response;
  try {
    response = await fetch(buildUrl(path, query), {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
      signal,
    });
  } catch (cause) {
    if (signal?.aborted) throw cause;
    throw new ApiError(0, 'network_error', 'Kernwright’s server could not be reached.');
  }

  const payload = await readJson(response);
  if (!response.ok) {
    const error = errorFromResponse(response.status, payload);
    if (response.status === 401 && authenticated) endSession('expired');
    throw error;
  }
  if (!schema) return undefined as T;
  const parsed = schema.safeParse(payload);
  if (!parsed.success) {
    throw new ApiError(response.status, 'unreadable_response', 'The server sent an answer this version of the app cannot read.');
  }
  return parsed.data;
}

/**
 * POSTs multipart form data through XMLHttpRequest, the one browser and React Native transport that
 * reports upload progress; errors take the same ApiError shape as every other call.
 */
function sendForm<T>(path: string, form: FormData, schema: z.ZodType<T>, onProgress?: (fraction: number) => void): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', buildUrl(path));
    xhr.setRequestHeader('Accept', 'application/json');
    const token = currentToken();
    if (token) xhr.setRequestHeader('Authorization', `Bearer ${token}`);
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0) onProgress?.(event.loaded / event.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'network_error', 'Kernwright’s server could not be reached.'));
    xhr.onload = () => {
      let payload: unknown;
      try {
        payload = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        payload = undefined;
      }
      if (xhr.status < 200 || xhr.status >= 300) {
        if (xhr.status === 401) endSession('expired');
        reject(errorFromResponse(xhr.status, payload));
        return;
      }
      const parsed = schema.safeParse(payload);
      if (parsed.success) resolve(parsed.data);
      else reject(new ApiError(xhr.status, 'unreadable_response', 'The server sent an answer this version of the app cannot read.'));
    };
    xhr.send(form);
  });
}

// Auth

export function signIn(credentials: SignInRequest): Promise<SignInResponse> {
  return request('/api/auth/sign-in', {
    method: 'POST',
    body: credentials,
    schema: signInResponseSchema,
    authenticated: false,
  });
}

const currentUserSchema = z.object({ user: userSchema });

export async function fetchCurrentUser(signal?: AbortSignal): Promise<User> {
  const { user } = await request('/api/auth/me', { schema: currentUserSchema, signal });
  return user;
}

export function signOut(): Promise<void> {
  return request<void>('/api/auth/sign-out', { method: 'POST' });
}

// Health

export function fetchHealth(signal?: AbortSignal): Promise<Health> {
  return request('/api/health', { schema: healthSchema, authenticated: false, signal });
}

// Users (administrators only)

/** The list query with its page numbers as numbers (the shared schema also accepts them as text). */
export type ListUsersParams = Omit<ListUsersQuery, 'limit' | 'offset'> & { limit: number; offset: number };

export function listUsers(query: ListUsersParams, signal?: AbortSignal): Promise<UserList> {
  return request('/api/users', {
    query: { q: query.q, role: query.role, active: query.active, limit: query.limit, offset: query.offset },
    schema: userListSchema,
    signal,
  });
}

export function createUser(body: CreateUserRequest): Promise<User> {
  return request('/api/users', { method: 'POST', body, schema: userSchema });
}

export function updateUser(id: string, changes: UpdateUserRequest): Promise<User> {
  return request(`/api/users/${encodeURIComponent(id)}`, { method: 'PATCH', body: changes, schema: userSchema });
}

// Lines and stations (everyone lists them; supervisors and administrators manage them)

export function createLine(body: { name: string }): Promise<Line> {
  return request('/api/stations/lines', { method: 'POST', body, schema: lineSchema });
}

export function createStation(body: { lineId: string; name: string; cameraNote?: string; partTypes?: string[] }): Promise<Station> {
  return request('/api/stations', { method: 'POST', body, schema: stationSchema });
}

export function updateStation(id: string, changes: { name?: string; cameraNote?: string; active?: boolean; partTypes?: string[] }): Promise<Station> {
  return request(`/api/stations/${encodeURIComponent(id)}`, { method: 'PATCH', body: changes, schema: stationSchema });
}

export function calibrateStation(id: string, body: CalibrationRequest): Promise<Station> {
  return request(`/api/stations/${encodeURIComponent(id)}/calibration`, { method: 'POST', body, schema: stationSchema });
}

// Review and release of rule versions (supervisors)

export function releaseRuleVersion(id: string, body: { password: string; meaning: 'review' | 'approval' | 'responsibility'; note: string }): Promise<RuleVersion> {
  return request(`/api/rule-versions/${encodeURIComponent(id)}/release`, { method: 'POST', body, schema: ruleVersionSchema });
}

export function sendBackRuleVersion(id: string, note: string): Promise<RuleVersion> {
  return request(`/api/rule-versions/${encodeURIComponent(id)}/send-back`, { method: 'POST', body: { note }, schema: ruleVersionSchema });
}

export function withdrawRuleVersion(id: string, reason: string): Promise<RuleVersion> {
  return request(`/api/rule-versions/${encodeURIComponent(id)}/withdraw`, { method: 'POST', body: { reason }, schema: ruleVersionSchema });
}

// Inspections and disputed verdicts

export interface InspectionUpload {
  photo: Blob;
  fileName: string;
  stationId: string;
  ruleVersionId: string;
  /** Made on the device once per photo and reused on every retry, so the server stores the inspection once. */
  idempotencyKey: string;
}

/**
 * Sends a photo for inspection as multipart form data. XMLHttpRequest rather than fetch, because only
 * it reports upload progress; errors take the same ApiError shape as every other call.
 */
export function uploadInspection(upload: InspectionUpload, onProgress?: (fraction: number) => void): Promise<Inspection> {
  const form = new FormData();
  form.append('stationId', upload.stationId);
  form.append('ruleVersionId', upload.ruleVersionId);
  form.append('idempotencyKey', upload.idempotencyKey);
  form.append('photo', upload.photo, upload.fileName);
  return sendForm('/api/inspections', form, inspectionSchema, onProgress);
}

export function fetchInspection(id: string, signal?: AbortSignal): Promise<Inspection> {
  return request(`/api/inspections/${encodeURIComponent(id)}`, { schema: inspectionSchema, signal });
}

export function disputeInspection(id: string, note: string): Promise<Inspection> {
  return request(`/api/inspections/${encodeURIComponent(id)}/dispute`, { method: 'POST', body: { note }, schema: inspectionSchema });
}

const disputeListSchema = z.object({ items: z.array(disputeItemSchema), total: z.number() });
export type DisputeList = { items: DisputeItem[]; total: number };

export function listDisputes(query: { state: 'open' | 'resolved'; limit: number; offset: number }, signal?: AbortSignal): Promise<DisputeList> {
  return request('/api/disputes', { query: { ...query }, schema: disputeListSchema, signal });
}

export function resolveDispute(id: string, body: { judgement: 'good' | 'defective'; note: string }): Promise<Inspection> {
  return request(`/api/disputes/${encodeURIComponent(id)}/resolve`, { method: 'POST', body, schema: inspectionSchema });
}

// Catalogue, kernels and stations (read by the engineer's workbench)

const itemsOf = <T,>(schema: z.ZodType<T>) => z.object({ items: z.array(schema) });

export async function listPartTypes(signal?: AbortSignal): Promise<PartType[]> {
  return (await request('/api/catalogue/part-types', { schema: itemsOf(partTypeSchema), signal })).items;
}

export async function listDefectKinds(signal?: AbortSignal): Promise<DefectKind[]> {
  return (await request('/api/catalogue/defect-kinds', { schema: itemsOf(defectKindSchema), signal })).items;
}

export async function listKernels(signal?: AbortSignal): Promise<KernelInfo[]> {
  return (await request('/api/kernels', { schema: itemsOf(kernelInfoSchema), signal })).items;
}

export interface NewKernel {
  name: string;
  matrix: number[][];
  divisor: number;
  offset: number;
  description: string;
}

export function createKernel(body: NewKernel): Promise<KernelInfo> {
  return request('/api/kernels', { method: 'POST', body, schema: kernelInfoSchema });
}

export async function listLines(signal?: AbortSignal): Promise<Line[]> {
  return (await request('/api/stations/lines', { schema: itemsOf(lineSchema), signal })).items;
}

// Reference sets

export async function listReferenceSets(signal?: AbortSignal): Promise<ReferenceSet[]> {
  return (await request('/api/reference-sets', { schema: itemsOf(referenceSetSchema), signal })).items;
}

export function getReferenceSet(id: string, signal?: AbortSignal): Promise<ReferenceSet> {
  return request(`/api/reference-sets/${encodeURIComponent(id)}`, { schema: referenceSetSchema, signal });
}

export function createReferenceSet(body: { name: string; partType: string; description: string }): Promise<ReferenceSet> {
  return request('/api/reference-sets', { method: 'POST', body, schema: referenceSetSchema });
}

export interface ReferenceImageQuery {
  label?: ImageLabel;
  defectKind?: string;
  limit: number;
  offset: number;
}

export function listReferenceImages(setId: string, query: ReferenceImageQuery, signal?: AbortSignal) {
  return request(`/api/reference-sets/${encodeURIComponent(setId)}/images`, {
    query: { label: query.label, defectKind: query.defectKind, limit: query.limit, offset: query.offset },
    schema: referenceImagePageSchema,
    signal,
  });
}

export interface LabelChange {
  label?: ImageLabel;
  defectKind?: string | null;
  note?: string;
}

export async function relabelReferenceImages(setId: string, imageIds: string[], change: LabelChange): Promise<ReferenceImage[]> {
  const schema = itemsOf(referenceImageSchema);
  return (await request(`/api/reference-sets/${encodeURIComponent(setId)}/labels`, { method: 'POST', body: { imageIds, change }, schema })).items;
}

export function relabelReferenceImage(imageId: string, change: LabelChange): Promise<ReferenceImage> {
  return request(`/api/reference-sets/images/${encodeURIComponent(imageId)}`, { method: 'PATCH', body: change, schema: referenceImageSchema });
}

/** A photo to upload: a File or Blob in a browser, or a local file address on a phone. */
export type UploadablePhoto = { name: string; blob: Blob } | { name: string; uri: string; type: string };

export interface PhotoUploadOptions {
  label?: ImageLabel;
  defectKind?: string;
  /** Fraction of the request body sent so far, 0..1. */
  onProgress?: (sent: number) => void;
}

/** Adds photos to a multipart body as field "photos". */
function appendPhotos(form: FormData, photos: UploadablePhoto[]): void {
  for (const photo of photos) {
    if ('blob' in photo) form.append('photos', photo.blob, photo.name);
    // React Native's FormData takes a { uri, name, type } object for a file on the device.
    else form.append('photos', { uri: photo.uri, name: photo.name, type: photo.type } as unknown as Blob);
  }
}

/**
 * Sends photos as multipart field "photos" through XMLHttpRequest, the one browser and React
 * Native transport that reports upload progress.
 */
export function uploadReferencePhotos(setId: string, photos: UploadablePhoto[], options: PhotoUploadOptions = {}): Promise<UploadOutcome[]> {
  const form = new FormData();
  if (options.label) form.append('label', options.label);
  if (options.defectKind) form.append('defectKind', options.defectKind);
  appendPhotos(form, photos);
  return sendForm(`/api/reference-sets/${encodeURIComponent(setId)}/images`, form, uploadResultSchema, options.onProgress).then((result) => {
    options.onProgress?.(1);
    return result.outcomes;
  });
}

/** A photo's samples exactly as the server decodes them, from its signed image address. */
export interface PhotoSamples {
  width: number;
  height: number;
  channels: 1 | 2 | 3 | 4;
  bitDepth: 8 | 16;
  samples: Uint8Array | Uint16Array;
}

export async function fetchPhotoSamples(imageUrl: string, signal?: AbortSignal): Promise<PhotoSamples> {
  const address = `${API_BASE_URL}${imageUrl.replace('?', '/samples?')}`;
  let response: Response;
  try {
    response = await fetch(address, { signal });
  } catch (cause) {
    if (signal?.aborted) throw cause;
    throw new ApiError(0, 'network_error', 'Kernwright’s server could not be reached.');
  }
  if (!response.ok) throw errorFromResponse(response.status, await readJson(response));
  const width = Number(response.headers.get('X-Photo-Width'));
  const height = Number(response.headers.get('X-Photo-Height'));
  const channels = Number(response.headers.get('X-Photo-Channels'));
  const bitDepth = Number(response.headers.get('X-Photo-Bit-Depth'));
  const bytes = await response.arrayBuffer();
  if (!(width > 0 && height > 0) || ![1, 2, 3, 4].includes(channels) || (bitDepth !== 8 && bitDepth !== 16)) {
    throw new ApiError(response.status, 'unreadable_response', 'The photo’s samples came without their size or bit depth.');
  }
  // Little-endian 16-bit samples, which every platform the app runs on reads natively.
  const samples = bitDepth === 16 ? new Uint16Array(bytes) : new Uint8Array(bytes);
  if (samples.length !== width * height * channels) {
    throw new ApiError(response.status, 'unreadable_response', 'The photo’s samples do not match its stated size.');
  }
  return { width, height, channels: channels as PhotoSamples['channels'], bitDepth, samples };
}

// Rules and rule versions

export interface RuleListQuery {
  q?: string;
  state?: RuleVersionState;
  partType?: string;
  /** "me" or a person's id. */
  owner?: string;
  limit: number;
  offset: number;
}

const ruleListSchema = z.object({ items: z.array(ruleSummarySchema), total: z.number() });

export function listRules(query: RuleListQuery, signal?: AbortSignal): Promise<{ items: RuleSummary[]; total: number }> {
  return request('/api/rules', { query: { ...query }, schema: ruleListSchema, signal });
}

export function getRule(id: string, signal?: AbortSignal): Promise<RuleDetail> {
  return request(`/api/rules/${encodeURIComponent(id)}`, { schema: ruleDetailSchema, signal });
}

export function createRule(body: { name: string; partType: string; smallestDefectMm: number | null; document: unknown }): Promise<RuleDetail> {
  return request('/api/rules', { method: 'POST', body, schema: ruleDetailSchema });
}

export function startNewDraft(ruleId: string, fromVersionId?: string): Promise<RuleVersion> {
  return request(`/api/rules/${encodeURIComponent(ruleId)}/versions`, { method: 'POST', body: { fromVersionId }, schema: ruleVersionSchema });
}

export function getRuleVersion(id: string, signal?: AbortSignal): Promise<RuleVersion> {
  return request(`/api/rule-versions/${encodeURIComponent(id)}`, { schema: ruleVersionSchema, signal });
}

/** Every version of a rule with its state changes, signatures, trials and what changed (engineers, supervisors, auditors). */
export function getRuleHistory(ruleId: string, signal?: AbortSignal): Promise<RuleHistory> {
  return request(`/api/rules/${encodeURIComponent(ruleId)}/history`, { schema: ruleHistorySchema, signal });
}

export function saveDraftDocument(versionId: string, document: unknown, authorNote?: string): Promise<RuleVersion> {
  return request(`/api/rule-versions/${encodeURIComponent(versionId)}/document`, { method: 'PUT', body: { document, authorNote }, schema: ruleVersionSchema });
}

export function submitForReview(versionId: string, note: string): Promise<RuleVersion> {
  return request(`/api/rule-versions/${encodeURIComponent(versionId)}/submit`, { method: 'POST', body: { note }, schema: ruleVersionSchema });
}

// Preview on the server (the authority the browser's preview is checked against)

export function runServerPreview(body: { document: unknown; referenceImageId: string; stationId?: string }): Promise<PreviewResult> {
  return request('/api/preview', { method: 'POST', body, schema: previewResultSchema });
}

// Trials

export function startTrial(body: { ruleVersionId: string; referenceSetId: string; stationId?: string }): Promise<Trial> {
  return request('/api/trials', { method: 'POST', body, schema: trialSchema });
}

export function getTrial(id: string, signal?: AbortSignal): Promise<Trial> {
  return request(`/api/trials/${encodeURIComponent(id)}`, { schema: trialSchema, signal });
}

export async function listTrialsOfVersion(versionId: string, signal?: AbortSignal): Promise<Trial[]> {
  return (await request(`/api/rule-versions/${encodeURIComponent(versionId)}/trials`, { schema: itemsOf(trialSchema), signal })).items;
}

export interface TrialResultQuery {
  outcome: 'all' | 'misjudged' | 'agrees';
  sort: 'file' | 'slowest';
  limit: number;
  offset: number;
}

const trialResultPageSchema = z.object({ items: z.array(trialResultSchema), total: z.number() });

export function listTrialResults(trialId: string, query: TrialResultQuery, signal?: AbortSignal): Promise<{ items: TrialResult[]; total: number }> {
  return request(`/api/trials/${encodeURIComponent(trialId)}/results`, { query: { ...query }, schema: trialResultPageSchema, signal });
}

export function getLimitSweep(trialId: string, gauge: string, bound: 'min' | 'max', signal?: AbortSignal): Promise<Sweep> {
  return request(`/api/trials/${encodeURIComponent(trialId)}/sweep`, { query: { gauge, bound }, schema: sweepSchema, signal });
}

// Records and the audit trail (auditors, supervisors)

export interface RecordQuery {
  from?: string;
  to?: string;
  lineId?: string;
  stationId?: string;
  ruleId?: string;
  partType?: string;
  /** The failing gauge or cause stored on the inspection (a Pareto bar). */
  cause?: string;
  verdict?: 'PASS' | 'FAIL' | 'RETAKE';
  disputed?: 'true' | 'false';
  after?: string;
  limit?: number;
}

export function listRecords(query: RecordQuery, signal?: AbortSignal): Promise<RecordPage> {
  return request('/api/records/inspections', { query: { ...query }, schema: recordPageSchema, signal });
}

export function verifyAuditTrail(signal?: AbortSignal): Promise<ChainVerificationResult> {
  return request('/api/audit-events/verify', { schema: chainVerificationSchema, signal });
}

// Trends: p-charts, causes and alerts (supervisors act on them; engineers and auditors may read)

export function fetchTrendChoices(signal?: AbortSignal): Promise<TrendChoices> {
  return request('/api/trends/choices', { schema: trendChoicesSchema, signal });
}

export function fetchPChart(query: PChartQuery, signal?: AbortSignal): Promise<PChart> {
  return request('/api/trends/p-chart', { query: { ...query }, schema: pChartSchema, signal });
}

export function fetchPareto(filters: TrendFilters, signal?: AbortSignal): Promise<Pareto> {
  return request('/api/trends/pareto', { query: { ...filters }, schema: paretoSchema, signal });
}

export function listAlerts(query: { state: 'open' | 'acknowledged' | 'all'; after?: string; limit: number }, signal?: AbortSignal): Promise<AlertPage> {
  return request('/api/alerts', { query: { ...query }, schema: alertPageSchema, signal });
}

export function acknowledgeAlert(id: string, note: string): Promise<Alert> {
  return request(`/api/alerts/${encodeURIComponent(id)}/acknowledge`, { method: 'POST', body: { note }, schema: alertSchema });
}

export async function listAlertLimits(signal?: AbortSignal): Promise<AlertLimit[]> {
  return (await request('/api/alert-limits', { schema: alertLimitListSchema, signal })).items;
}

export function createAlertLimit(body: CreateAlertLimit): Promise<AlertLimit> {
  return request('/api/alert-limits', { method: 'POST', body, schema: alertLimitSchema });
}

export function deleteAlertLimit(id: string): Promise<void> {
  return request<void>(`/api/alert-limits/${encodeURIComponent(id)}`, { method: 'DELETE' });
}

export function fetchAlertSubscription(signal?: AbortSignal): Promise<AlertSubscription> {
  return request('/api/alerts/subscription', { schema: alertSubscriptionSchema, signal });
}

export function setAlertSubscription(subscribed: boolean): Promise<AlertSubscription> {
  return request('/api/alerts/subscription', { method: 'PUT', body: { subscribed }, schema: alertSubscriptionSchema });
}

// Agreement studies (measurement system analysis)

/** Sends 2..50 photos of one part with the study's fields as multipart form data. */
export function createRepeatabilityStudy(fields: CreateRepeatabilityStudy, photos: UploadablePhoto[], onProgress?: (sent: number) => void): Promise<RepeatabilityStudy> {
  const form = new FormData();
  form.append('ruleVersionId', fields.ruleVersionId);
  form.append('stationId', fields.stationId);
  form.append('partLabel', fields.partLabel);
  form.append('knownLabel', fields.knownLabel);
  appendPhotos(form, photos);
  return sendForm('/api/studies/repeatability', form, repeatabilityStudySchema, onProgress);
}

export async function listRepeatabilityStudies(signal?: AbortSignal): Promise<RepeatabilityStudy[]> {
  return (await request('/api/studies/repeatability', { schema: repeatabilityStudyListSchema, signal })).items;
}

export function fetchAttributeAgreement(query: AttributeAgreementQuery, signal?: AbortSignal): Promise<AttributeAgreement> {
  return request('/api/studies/attribute-agreement', { query: { ...query }, schema: attributeAgreementSchema, signal });
}

/**
 * Downloads a file the API streams (CSV export, PDF report) with the session's token, reporting
 * progress as the bytes arrive; resolves to the file as a Blob and the server's headers.
 */
export async function downloadFile(path: string, query: Record<string, QueryValue> = {}, onChunk?: (bytes: number, headers: Headers) => void): Promise<{ blob: Blob; headers: Headers }> {
  const token = currentToken();
  let response: Response;
  try {
    response = await fetch(buildUrl(path, query), { headers: token ? { Authorization: `Bearer ${token}` } : {} });
  } catch {
    throw new ApiError(0, 'network_error', 'Kernwright’s server could not be reached.');
  }
  if (!response.ok) {
    const error = errorFromResponse(response.status, await readJson(response));
    if (response.status === 401) endSession('expired');
    throw error;
  }
  const reader = response.body?.getReader();
  if (!reader) return { blob: await response.blob(), headers: response.headers };
  const parts: Uint8Array[] = [];
  let bytes = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    parts.push(value);
    bytes += value.length;
    onChunk?.(bytes, response.headers);
  }
  return { blob: new Blob(parts as BlobPart[], { type: response.headers.get('Content-Type') ?? 'application/octet-stream' }), headers: response.headers };
}
