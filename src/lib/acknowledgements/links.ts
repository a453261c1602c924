// Paths inside the app that acknowledgement mail and pages link to.

export const acknowledgementPath = (studyId: string, requestId: string) => `/studies/${studyId}/acknowledgements/${requestId}`;

export const protocolVersionPath = (studyId: string, versionId: string) => `/studies/${studyId}/protocol/${versionId}`;

/** Redline of `toVersionId` against `fromVersionId` (the version the reader last acknowledged). */
export const redlinePath = (studyId: string, fromVersionId: string, toVersionId: string) =>
  `/studies/${studyId}/protocol/compare?from=${encodeURIComponent(fromVersionId)}&to=${encodeURIComponent(toVersionId)}`;
