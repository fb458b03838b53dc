/**
 * Every JSON route (and the file downloads beside them) of Framewright, in one list: the contract
 * the `+server.ts` handlers answer to, the typed client calls and the route tests check. Built only
 * from the schemas in this folder, so OpenAPI (or any other description) can be generated from it.
 */
import type { z } from 'zod';
import { alertReplayInputSchema } from '../can/alerts/replay';
import {
	alertReplaySchema,
	captureBusLoadResponseSchema,
	decodeInputSchema,
	decodeResponseSchema,
	defineFrameInputSchema,
	definedFrameResponseSchema,
	exportQuerySchema,
	frameDetailQuerySchema,
	frameDetailSchema,
	frameExistsProblemSchema,
	framesQuerySchema,
	framesResponseSchema,
	seriesQuerySchema,
	seriesResponseSchema
} from './capture-views';
import {
	captureDetailSchema,
	captureListResponseSchema,
	captureStatusResponseSchema,
	processCaptureInputSchema,
	processResponseSchema,
	tooLargeProblemSchema,
	uploadQuerySchema,
	uploadResponseSchema
} from './captures';
import { endpoint, fillPath, queryString, type PathParams } from './endpoint';
import {
	acceptConflictProblemSchema,
	acceptedFieldsResponseSchema,
	acceptFieldsInputSchema,
	correlateQuerySchema,
	correlateResponseSchema,
	fieldsQuerySchema,
	fieldsResponseSchema
} from './field-proposals';
import { openApiDocumentSchema } from './meta';
import { problemBodySchema } from './problem';
import {
	codegenQuerySchema,
	createdMapResponseSchema,
	createdShareLinkResponseSchema,
	createMapInputSchema,
	diffQuerySchema,
	diffResponseSchema,
	draftInputSchema,
	draftSavedResponseSchema,
	mapExportQuerySchema,
	mapListResponseSchema,
	mapViewSchema,
	publishedResponseSchema,
	publishInputSchema,
	renamedMapResponseSchema,
	renameInputSchema,
	restoreInputSchema,
	revisionListResponseSchema,
	revisionViewSchema,
	shareLinkInputSchema,
	shareLinkListResponseSchema,
	staleDraftProblemSchema,
	versionResponseSchema
} from './maps';
import {
	checkInputSchema,
	checkResponseSchema,
	createdProfileResponseSchema,
	createProfileInputSchema,
	deviceAlertReplaySchema,
	deviceAlertsInputSchema,
	linkSuggestionsInputSchema,
	linkSuggestionsResponseSchema,
	manualLinkInputSchema,
	manualLinkResponseSchema,
	profileDiffResponseSchema,
	profileDraftInputSchema,
	profileDraftSavedResponseSchema,
	profileListResponseSchema,
	profilePublishedResponseSchema,
	profileRevisionListResponseSchema,
	profileViewSchema,
	receiverExportQuerySchema,
	relinkedResponseSchema,
	relinkInputSchema,
	relinkQuerySchema,
	relinkReviewSchema
} from './receivers';
import { busLoadQuerySchema, busLoadResponseSchema } from './tools';
import {
	derivedExportQuerySchema,
	derivedSeriesQuerySchema,
	derivedSeriesResponseSchema,
	savedViewListSchema,
	savedViewSchema,
	saveViewInputSchema,
	spanQuerySchema,
	spanResponseSchema
} from './workbench';
import {
	createdWorkspaceResponseSchema,
	invitationInputSchema,
	invitationResponseSchema,
	memberResponseSchema,
	membersOverviewSchema,
	renamedWorkspaceResponseSchema,
	roleChangeSchema,
	workspaceInputSchema,
	workspaceListResponseSchema
} from './workspaces';

const INVALID = 'Some of the values were not accepted.';
const WS = '/api/workspaces/{ws}';
const MAP = `${WS}/maps/{mapId}`;
const CAPTURE = `${WS}/captures/{id}`;
const PROFILE = `${WS}/receivers/{profileId}`;

const noMap =
	'That map, revision or workspace no longer exists (or you are not a member of the workspace).';
const stale = [
	'This map was changed by someone else since you loaded it. Reload to see their changes; your edit was not saved.',
	staleDraftProblemSchema
] as [string, typeof staleDraftProblemSchema];
const noCapture =
	'That capture, decode or map no longer exists (or you are not a member of the workspace).';
const notReady = 'The capture is not processed yet, or could not be processed.';
const mapGone =
	'The map this decode used was deleted, or its draft has changed since; decode again.';
const noProfile =
	'That receiver profile, its revision, map or capture no longer exists (or you are not a member of the workspace).';
const staleProfile = [
	'This receiver profile was changed by someone else since you loaded it. Reload to see their changes; your edit was not saved.',
	staleDraftProblemSchema
] as [string, typeof staleDraftProblemSchema];
const notLinked =
	'The profile is not linked to a map revision (or its map was deleted), or the capture is not processed yet.';
const lastOwner = 'That would leave the workspace without an owner. Make someone else owner first.';
const csv = 'text/csv; charset=utf-8';

export const endpoints = {
	// ---- workspaces, members, invitations ----
	'workspaces.list': endpoint({
		method: 'GET',
		path: '/api/workspaces',
		summary: "The signed-in person's workspaces and their role in each.",
		access: 'signed-in',
		status: 200,
		response: workspaceListResponseSchema
	}),
	'workspaces.create': endpoint(
		{
			method: 'POST',
			path: '/api/workspaces',
			summary: 'Creates a workspace; the caller becomes its owner.',
			access: 'signed-in',
			body: workspaceInputSchema,
			status: 201,
			response: createdWorkspaceResponseSchema
		},
		{
			400: INVALID,
			403: 'An access token works only inside its own workspace; sign in to create a workspace.'
		}
	),
	'workspaces.rename': endpoint(
		{
			method: 'PATCH',
			path: WS,
			summary: 'Renames the workspace (its slug, and so its links, stay).',
			access: 'owner',
			body: workspaceInputSchema,
			status: 200,
			response: renamedWorkspaceResponseSchema
		},
		{ 400: INVALID }
	),
	'workspaces.delete': endpoint({
		method: 'DELETE',
		path: WS,
		summary: 'Deletes the workspace with its members and invitations (the audit trail stays).',
		access: 'owner',
		status: 204
	}),
	'members.list': endpoint({
		method: 'GET',
		path: `${WS}/members`,
		summary: 'Members, pending invitations (owners only) and the caller’s own role and id.',
		access: 'viewer',
		status: 200,
		response: membersOverviewSchema
	}),
	'members.changeRole': endpoint(
		{
			method: 'PATCH',
			path: `${WS}/members/{userId}`,
			summary: "Changes a member's role.",
			access: 'owner',
			body: roleChangeSchema,
			status: 200,
			response: memberResponseSchema
		},
		{
			400: INVALID,
			404: 'That member, invitation or workspace no longer exists.',
			409: lastOwner
		}
	),
	'members.remove': endpoint(
		{
			method: 'DELETE',
			path: `${WS}/members/{userId}`,
			summary: 'Removes a member (owners), or leaves the workspace (anyone, with their own id).',
			access: 'viewer',
			status: 204
		},
		{
			403: 'Only an owner can remove someone else.',
			404: 'That member, invitation or workspace no longer exists.',
			409: lastOwner
		}
	),
	'invitations.create': endpoint(
		{
			method: 'POST',
			path: `${WS}/invitations`,
			summary: 'Invites an e-mail address with a role; the link goes out by e-mail.',
			access: 'owner',
			body: invitationInputSchema,
			status: 201,
			response: invitationResponseSchema
		},
		{
			400: INVALID,
			409: 'That address is already a member of this workspace.',
			429: 'Too many invitations from this account or network in the last hour; try again later.'
		}
	),
	'invitations.revoke': endpoint(
		{
			method: 'DELETE',
			path: `${WS}/invitations/{id}`,
			summary: 'Withdraws a pending invitation.',
			access: 'owner',
			status: 204
		},
		{ 404: 'That member, invitation or workspace no longer exists.' }
	),

	// ---- maps ----
	'maps.list': endpoint({
		method: 'GET',
		path: `${WS}/maps`,
		summary: 'The workspace’s maps, most recently changed first.',
		access: 'viewer',
		status: 200,
		response: mapListResponseSchema
	}),
	'maps.create': endpoint(
		{
			method: 'POST',
			path: `${WS}/maps`,
			summary:
				'Creates a map: blank, from map JSON or from the CSV signal table (a bad file is refused whole, with every problem).',
			access: 'editor',
			body: createMapInputSchema,
			status: 201,
			response: createdMapResponseSchema
		},
		{ 400: 'The file has problems; nothing was imported.' }
	),
	'maps.get': endpoint(
		{
			method: 'GET',
			path: MAP,
			summary: 'The map with its draft, lint problems, revisions and the caller’s role.',
			access: 'viewer',
			status: 200,
			response: mapViewSchema
		},
		{ 404: noMap }
	),
	'maps.rename': endpoint(
		{
			method: 'PATCH',
			path: MAP,
			summary: 'Renames the map (a draft change: versioned).',
			access: 'editor',
			body: renameInputSchema,
			status: 200,
			response: renamedMapResponseSchema
		},
		{ 400: INVALID, 404: noMap, 409: stale }
	),
	'maps.delete': endpoint(
		{
			method: 'DELETE',
			path: MAP,
			summary: 'Deletes the map with its revisions and share links.',
			access: 'owner',
			status: 204
		},
		{ 404: noMap }
	),
	'maps.saveDraft': endpoint(
		{
			method: 'PUT',
			path: `${MAP}/draft`,
			summary:
				'Replaces the draft if nobody changed it since `version` (a draft may hold lint errors).',
			access: 'editor',
			body: draftInputSchema,
			status: 200,
			response: draftSavedResponseSchema
		},
		{ 400: INVALID, 404: noMap, 409: stale }
	),
	'maps.revisions': endpoint(
		{
			method: 'GET',
			path: `${MAP}/revisions`,
			summary: 'Published revisions, newest first.',
			access: 'viewer',
			status: 200,
			response: revisionListResponseSchema
		},
		{ 404: noMap }
	),
	'maps.publish': endpoint(
		{
			method: 'POST',
			path: `${MAP}/revisions`,
			summary:
				'Publishes the reviewed draft version as the next revision and tells the other members by e-mail.',
			access: 'editor',
			body: publishInputSchema,
			status: 201,
			response: publishedResponseSchema
		},
		{
			400: INVALID,
			404: noMap,
			409: stale,
			422: 'The draft has lint errors, so it cannot be published yet.'
		}
	),
	'maps.revision': endpoint(
		{
			method: 'GET',
			path: `${MAP}/revisions/{n}`,
			summary: 'One published revision with its lint problems.',
			access: 'viewer',
			status: 200,
			response: revisionViewSchema
		},
		{ 404: noMap }
	),
	'maps.diff': endpoint(
		{
			method: 'GET',
			path: `${MAP}/diff`,
			summary: 'Field-by-field differences between two revisions (or a revision and the draft).',
			access: 'viewer',
			query: diffQuerySchema,
			status: 200,
			response: diffResponseSchema
		},
		{ 400: INVALID, 404: noMap }
	),
	'maps.restore': endpoint(
		{
			method: 'POST',
			path: `${MAP}/restore`,
			summary: 'Copies a revision into the draft (a draft change: versioned).',
			access: 'editor',
			body: restoreInputSchema,
			status: 200,
			response: versionResponseSchema
		},
		{ 400: INVALID, 404: noMap, 409: stale }
	),
	'maps.shareLinks': endpoint(
		{
			method: 'GET',
			path: `${MAP}/share-links`,
			summary: 'The map’s share links with their status.',
			access: 'viewer',
			status: 200,
			response: shareLinkListResponseSchema
		},
		{ 404: noMap }
	),
	'maps.createShareLink': endpoint(
		{
			method: 'POST',
			path: `${MAP}/share-links`,
			summary: 'A read-only link to one revision; its URL is in this answer only.',
			access: 'editor',
			body: shareLinkInputSchema,
			status: 201,
			response: createdShareLinkResponseSchema
		},
		{ 400: INVALID, 404: noMap }
	),
	'maps.revokeShareLink': endpoint(
		{
			method: 'DELETE',
			path: `${MAP}/share-links/{id}`,
			summary: 'Revokes a share link (revoking twice changes nothing).',
			access: 'editor',
			status: 204
		},
		{ 404: noMap }
	),
	'maps.export': endpoint(
		{
			method: 'GET',
			path: '/w/{ws}/maps/{mapId}/export',
			summary: 'The map as of a revision (or the draft) as map JSON or the CSV signal table.',
			access: 'viewer',
			query: mapExportQuerySchema,
			status: 200,
			download: 'application/json or text/csv'
		},
		{ 400: INVALID, 404: noMap }
	),
	'maps.codegen': endpoint(
		{
			method: 'GET',
			path: '/w/{ws}/maps/{mapId}/codegen',
			summary:
				'C99 code for firmware from a revision (or the draft): the header or the source of one generation (docs/codegen.md).',
			access: 'viewer',
			query: codegenQuerySchema,
			status: 200,
			download: 'text/x-c; charset=utf-8'
		},
		{ 400: INVALID, 404: noMap }
	),
	'maps.template': endpoint({
		method: 'GET',
		path: '/w/{ws}/maps/template.csv',
		summary: 'An empty CSV signal table with its header and an example row.',
		access: 'viewer',
		status: 200,
		download: csv
	}),
	'share.export': endpoint(
		{
			method: 'GET',
			path: '/s/{token}/export',
			summary: 'The shared revision as map JSON or the CSV signal table (anyone with the link).',
			access: 'public',
			query: mapExportQuerySchema.pick({ format: true }),
			status: 200,
			download: 'application/json or text/csv'
		},
		{ 400: INVALID, 404: 'This link was revoked or has expired' }
	),

	// ---- captures ----
	'captures.list': endpoint({
		method: 'GET',
		path: `${WS}/captures`,
		summary: 'The workspace’s captures, newest upload first.',
		access: 'viewer',
		status: 200,
		response: captureListResponseSchema
	}),
	'captures.upload': endpoint(
		{
			method: 'POST',
			path: `${WS}/captures`,
			summary:
				'Stores an uploaded capture file (the raw bytes as the body) and guesses its column layout.',
			access: 'viewer',
			query: uploadQuerySchema,
			body: 'binary',
			status: 201,
			response: uploadResponseSchema
		},
		{
			400: 'The file is empty, or its name is missing.',
			413: ['The file is larger than the upload limit; nothing was stored.', tooLargeProblemSchema],
			415: 'This file is not a capture Framewright can read; nothing was stored.'
		}
	),
	'captures.get': endpoint(
		{
			method: 'GET',
			path: CAPTURE,
			summary: 'The capture with its detected and confirmed layout, import report and decodes.',
			access: 'viewer',
			status: 200,
			response: captureDetailSchema
		},
		{ 404: noCapture }
	),
	'captures.delete': endpoint(
		{
			method: 'DELETE',
			path: CAPTURE,
			summary: 'Deletes a capture (owners: any; others: their own uploads) with its files.',
			access: 'viewer',
			status: 204
		},
		{
			403: 'Only a workspace owner or the person who uploaded this capture can delete it.',
			404: noCapture,
			409: 'This capture is being processed; delete it when processing has ended.'
		}
	),
	'captures.status': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/status`,
			summary: 'Processing status and progress, for polling.',
			access: 'viewer',
			status: 200,
			response: captureStatusResponseSchema
		},
		{ 404: noCapture }
	),
	'captures.process': endpoint(
		{
			method: 'POST',
			path: `${CAPTURE}/process`,
			summary:
				'Starts parsing with the confirmed layout (a processed capture is read again, replacing its result once done); poll the status for progress.',
			access: 'viewer',
			body: processCaptureInputSchema,
			status: 202,
			response: processResponseSchema
		},
		{ 400: INVALID, 404: noCapture, 409: 'This capture is being processed already.' }
	),
	'captures.decode': endpoint(
		{
			method: 'POST',
			path: `${CAPTURE}/decode`,
			summary: 'Decodes the processed capture with a map revision (or the draft) and records it.',
			access: 'viewer',
			body: decodeInputSchema,
			status: 200,
			response: decodeResponseSchema
		},
		{ 400: INVALID, 404: noCapture, 409: notReady }
	),
	'captures.getDecode': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/decodes/{decodeId}`,
			summary: 'A recorded decode’s summary (decoded again from the stored frames if needed).',
			access: 'viewer',
			status: 200,
			response: decodeResponseSchema
		},
		{ 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.alerts': endpoint(
		{
			method: 'POST',
			path: `${CAPTURE}/alerts`,
			summary:
				'The alert rules of the decode’s map replayed over its channels (nothing is stored).',
			access: 'viewer',
			body: alertReplayInputSchema,
			status: 200,
			response: alertReplaySchema
		},
		{ 400: INVALID, 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.busLoad': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/bus-load`,
			summary:
				'Bus load over time, one series per bus, at the capture’s own bit rate (not a map’s).',
			access: 'viewer',
			status: 200,
			response: captureBusLoadResponseSchema
		},
		{ 404: noCapture, 409: notReady }
	),
	'captures.frames': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/frames`,
			summary: 'A page of received frames in capture order, optionally of one ID.',
			access: 'viewer',
			query: framesQuerySchema,
			status: 200,
			response: framesResponseSchema
		},
		{ 400: INVALID, 404: noCapture, 409: notReady }
	),
	'captures.frame': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/frames/{index}`,
			summary: 'One received frame and its signals as the decode’s map reads them.',
			access: 'viewer',
			query: frameDetailQuerySchema.pick({ decode: true }),
			status: 200,
			response: frameDetailSchema
		},
		{ 400: INVALID, 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.series': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/series`,
			summary: 'One channel over a time range, min/max-decimated to the points asked for.',
			access: 'viewer',
			query: seriesQuerySchema,
			status: 200,
			response: seriesResponseSchema
		},
		{ 400: INVALID, 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.defineFrame': endpoint(
		{
			method: 'POST',
			path: `${CAPTURE}/define-frame`,
			summary: 'Adds a frame (no signals yet) for an ID the decode’s map does not define.',
			access: 'editor',
			body: defineFrameInputSchema,
			status: 200,
			response: definedFrameResponseSchema
		},
		{
			400: INVALID,
			404: noCapture,
			409: ['The map already defines this ID.', frameExistsProblemSchema],
			410: mapGone
		}
	),
	'captures.fields': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/fields`,
			summary:
				'Proposed fields (constants, counters, checksums, multiplexors, values) of the IDs the decode’s map does not define, or of one.',
			access: 'viewer',
			query: fieldsQuerySchema,
			status: 200,
			response: fieldsResponseSchema
		},
		{ 400: INVALID, 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.fieldsCorrelate': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/fields/correlate`,
			summary:
				'Candidate value fields of the unknown IDs ranked by correlation with a decoded channel, with a least-squares scale and offset and a scatter of the best.',
			access: 'viewer',
			query: correlateQuerySchema,
			status: 200,
			response: correlateResponseSchema
		},
		{ 400: INVALID, 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.fieldsAccept': endpoint(
		{
			method: 'POST',
			path: `${CAPTURE}/fields/accept`,
			summary:
				'Adds a frame for an unknown ID with the accepted proposals as its signals to a map’s draft.',
			access: 'editor',
			body: acceptFieldsInputSchema,
			status: 200,
			response: acceptedFieldsResponseSchema
		},
		{
			400: INVALID,
			404: noCapture,
			409: [
				'The draft was changed since it was read (reload), or it already defines this ID.',
				acceptConflictProblemSchema
			],
			410: mapGone
		}
	),
	'captures.export': endpoint(
		{
			method: 'GET',
			path: '/w/{ws}/captures/{id}/export',
			summary:
				'A streamed CSV: the decoded channels (long or wide form) or the raw frames in the canonical layout.',
			access: 'viewer',
			query: exportQuerySchema,
			status: 200,
			download: csv
		},
		{ 400: INVALID, 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.derivedSeries': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/derived-series`,
			summary:
				'A derived channel (a formula over the decode’s channels, docs/derived-channels.md), min/max-decimated.',
			access: 'viewer',
			query: derivedSeriesQuerySchema,
			status: 200,
			response: derivedSeriesResponseSchema
		},
		{
			400: 'The formula does not read (the issue’s column says where), or a parameter is invalid.',
			404: noCapture,
			409: notReady,
			410: mapGone
		}
	),
	'captures.span': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/span`,
			summary:
				'Statistics, time above a threshold and a histogram of a channel over a span, and XY pairs with a second channel.',
			access: 'viewer',
			query: spanQuerySchema,
			status: 200,
			response: spanResponseSchema
		},
		{
			400: 'A formula does not read (the issue’s column says where), or a parameter is invalid.',
			404: noCapture,
			409: notReady,
			410: mapGone
		}
	),
	'captures.exportDerived': endpoint(
		{
			method: 'GET',
			path: '/w/{ws}/captures/{id}/export/derived',
			summary:
				'A streamed CSV of the decode’s channels followed by derived channels, in long or wide form.',
			access: 'viewer',
			query: derivedExportQuerySchema,
			status: 200,
			download: csv
		},
		{ 400: INVALID, 404: noCapture, 409: notReady, 410: mapGone }
	),
	'captures.views': endpoint(
		{
			method: 'GET',
			path: `${CAPTURE}/views`,
			summary: 'The saved views of a capture’s workbench.',
			access: 'viewer',
			status: 200,
			response: savedViewListSchema
		},
		{ 404: noCapture }
	),
	'captures.saveView': endpoint(
		{
			method: 'POST',
			path: `${CAPTURE}/views`,
			summary:
				'Saves the workbench view under a name (the same person saving the same name replaces it).',
			access: 'viewer',
			body: saveViewInputSchema,
			status: 201,
			response: savedViewSchema
		},
		{ 400: INVALID, 404: noCapture, 409: 'This capture has too many saved views.' }
	),
	'captures.deleteView': endpoint(
		{
			method: 'DELETE',
			path: `${CAPTURE}/views/{viewId}`,
			summary: 'Deletes a saved view (its author, or an owner).',
			access: 'viewer',
			status: 204
		},
		{
			403: 'Only the person who saved this view, or a workspace owner, can delete it.',
			404: 'That capture or saved view does not exist.'
		}
	),

	// ---- the API itself ----
	'meta.openapi': endpoint({
		method: 'GET',
		path: '/api/openapi.json',
		summary:
			'This API described in OpenAPI 3.1, generated from the same schemas the routes validate with.',
		access: 'public',
		status: 200,
		response: openApiDocumentSchema
	}),
	// ---- receiver profiles ----
	'receivers.list': endpoint({
		method: 'GET',
		path: `${WS}/receivers`,
		summary: 'The workspace’s receiver profiles with the map revision each is linked to.',
		access: 'viewer',
		status: 200,
		response: profileListResponseSchema
	}),
	'receivers.create': endpoint(
		{
			method: 'POST',
			path: `${WS}/receivers`,
			summary:
				'Creates a receiver profile: blank (a name and kind) or from a framewright-profile@1 file (a bad file is refused whole).',
			access: 'editor',
			body: createProfileInputSchema,
			status: 201,
			response: createdProfileResponseSchema
		},
		{ 400: 'The file has problems; nothing was imported.' }
	),
	'receivers.get': endpoint(
		{
			method: 'GET',
			path: PROFILE,
			summary:
				'The profile with its draft (profile, link target, links), revisions, the maps to link to and the caller’s role.',
			access: 'viewer',
			status: 200,
			response: profileViewSchema
		},
		{ 404: noProfile }
	),
	'receivers.delete': endpoint(
		{
			method: 'DELETE',
			path: PROFILE,
			summary: 'Deletes the profile with its revisions.',
			access: 'owner',
			status: 204
		},
		{ 404: noProfile }
	),
	'receivers.saveDraft': endpoint(
		{
			method: 'PUT',
			path: `${PROFILE}/draft`,
			summary:
				'Replaces the draft if nobody changed it since `version`; every link must name a signal of its map revision with the conversion its units need.',
			access: 'editor',
			body: profileDraftInputSchema,
			status: 200,
			response: profileDraftSavedResponseSchema
		},
		{ 400: INVALID, 404: noProfile, 409: staleProfile }
	),
	'receivers.revisions': endpoint(
		{
			method: 'GET',
			path: `${PROFILE}/revisions`,
			summary: 'Published revisions of the profile, newest first.',
			access: 'viewer',
			status: 200,
			response: profileRevisionListResponseSchema
		},
		{ 404: noProfile }
	),
	'receivers.publish': endpoint(
		{
			method: 'POST',
			path: `${PROFILE}/revisions`,
			summary: 'Publishes the reviewed draft version as the next revision of the profile.',
			access: 'editor',
			body: publishInputSchema,
			status: 201,
			response: profilePublishedResponseSchema
		},
		{
			400: INVALID,
			404: noProfile,
			409: staleProfile,
			422: 'A required wanted channel has no link, so the profile cannot be published yet.'
		}
	),
	'receivers.diff': endpoint(
		{
			method: 'GET',
			path: `${PROFILE}/diff`,
			summary:
				'Field-by-field differences between two revisions of the profile (or one and the draft).',
			access: 'viewer',
			query: diffQuerySchema,
			status: 200,
			response: profileDiffResponseSchema
		},
		{ 400: INVALID, 404: noProfile }
	),
	'receivers.suggestLinks': endpoint(
		{
			method: 'POST',
			path: `${PROFILE}/links/suggestions`,
			summary:
				'Candidates (score and reason) and automatic links of a working copy against a map revision; links made by hand are kept. Nothing is stored.',
			access: 'editor',
			body: linkSuggestionsInputSchema,
			status: 200,
			response: linkSuggestionsResponseSchema
		},
		{ 400: INVALID, 404: noProfile }
	),
	'receivers.manualLink': endpoint(
		{
			method: 'POST',
			path: `${PROFILE}/links/manual`,
			summary:
				'A wanted channel linked by hand to a frame · signal, with its conversion, or why it cannot be. Nothing is stored.',
			access: 'editor',
			body: manualLinkInputSchema,
			status: 200,
			response: manualLinkResponseSchema
		},
		{
			400: 'That link cannot be made (no such signal, or units that do not convert).',
			404: noProfile
		}
	),
	'receivers.relinkReview': endpoint(
		{
			method: 'GET',
			path: `${PROFILE}/relink`,
			summary:
				'What moving the draft’s links to a newer map revision (the latest by default) keeps, changes and breaks.',
			access: 'viewer',
			query: relinkQuerySchema,
			status: 200,
			response: relinkReviewSchema
		},
		{ 400: INVALID, 404: noProfile, 409: notLinked }
	),
	'receivers.relink': endpoint(
		{
			method: 'POST',
			path: `${PROFILE}/relink`,
			summary:
				'Moves the reviewed draft version to the newer map revision in one step, taking the suggestions named in `accept`.',
			access: 'editor',
			body: relinkInputSchema,
			status: 200,
			response: relinkedResponseSchema
		},
		{
			400: INVALID,
			404: noProfile,
			409: [
				'This receiver profile was changed by someone else since you loaded it, or it is not linked to a map.',
				problemBodySchema
			]
		}
	),
	'receivers.check': endpoint(
		{
			method: 'POST',
			path: `${PROFILE}/check`,
			summary:
				'The installer’s checklist of the profile (draft or revision) on a processed capture, decoded with the linked map revision. Nothing is stored.',
			access: 'viewer',
			body: checkInputSchema,
			status: 200,
			response: checkResponseSchema
		},
		{ 400: INVALID, 404: noProfile, 409: notLinked }
	),
	'receivers.alerts': endpoint(
		{
			method: 'POST',
			path: `${PROFILE}/alerts`,
			summary:
				'The profile’s device alert rules replayed over a processed capture in the device’s units. Nothing is stored.',
			access: 'viewer',
			body: deviceAlertsInputSchema,
			status: 200,
			response: deviceAlertReplaySchema
		},
		{ 400: INVALID, 404: noProfile, 409: notLinked }
	),
	'receivers.export': endpoint(
		{
			method: 'GET',
			path: '/w/{ws}/receivers/{profileId}/export',
			summary:
				'The profile (draft or revision) as its receive set (framewright-receive@1) or as the profile file (framewright-profile@1).',
			access: 'viewer',
			query: receiverExportQuerySchema,
			status: 200,
			download: 'application/json'
		},
		{ 400: INVALID, 404: noProfile, 409: notLinked }
	),

	// ---- tools ----
	'tools.busLoad': endpoint(
		{
			method: 'GET',
			path: `${WS}/tools/bus-load`,
			summary: 'Planned bus load of a map revision (or its draft) from its frames’ cycle times.',
			access: 'viewer',
			query: busLoadQuerySchema,
			status: 200,
			response: busLoadResponseSchema
		},
		{ 400: INVALID, 404: noMap }
	)
};

export type Endpoints = typeof endpoints;
export type EndpointName = keyof Endpoints;

// ---- types of a call, read from the schemas ----

type Def<K extends EndpointName> = Endpoints[K];
export type ParamsOf<K extends EndpointName> = {
	[P in PathParams<Def<K>['path']>]: string | number;
};
/** Query values arrive as text on the server; the caller may give numbers and booleans. */
export type QueryOf<K extends EndpointName> =
	Def<K> extends { query: infer Q extends z.ZodType }
		? { [P in keyof z.input<Q>]: z.input<Q>[P] | number | boolean }
		: never;
type BodyOf<K extends EndpointName> =
	Def<K> extends { body: infer B extends z.ZodType } ? z.input<B> : never;

/** What a successful call resolves to (undefined for 204). */
export type ResponseOf<K extends EndpointName> =
	Def<K> extends {
		response: infer R extends z.ZodType;
	}
		? z.output<R>
		: void;

type ParamsPart<P> = keyof P extends never ? { params?: P } : { params: P };
type QueryPart<K extends EndpointName> = [QueryOf<K>] extends [never]
	? { query?: never }
	: object extends QueryOf<K>
		? { query?: QueryOf<K> }
		: { query: QueryOf<K> };
type BodyPart<K extends EndpointName> = [BodyOf<K>] extends [never]
	? { body?: never }
	: { body: BodyOf<K> };

export type CallInput<K extends EndpointName, P = ParamsOf<K>> = ParamsPart<P> &
	QueryPart<K> &
	BodyPart<K> & { signal?: AbortSignal };

/** The URL of an endpoint (for links and downloads too): path parameters filled, query appended. */
export function endpointUrl<K extends EndpointName>(
	name: K,
	input: { params?: ParamsOf<K>; query?: QueryOf<K> }
): string {
	const def = endpoints[name];
	return (
		fillPath(def.path, (input.params ?? {}) as Record<string, string | number>) +
		queryString(input.query as Record<string, unknown> | undefined)
	);
}
