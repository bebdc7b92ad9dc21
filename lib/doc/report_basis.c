/* report_basis.c - the closing pages of the report: the published methods
 * the results rest on, what the model leaves out, and the cautions. */
#include "report_impl.h"

#include <stdio.h>

static const char *const methods[] = {
    "Rowell & Finlayson (1922), \"Screw viscosity pumps\", Engineering "
    "114, 606: flow in a screw pump as drag flow minus pressure flow in "
    "the unwound channel, with the flight-edge correction factors.",
    "Darnell & Mol (1956), \"Solids conveying in extruders\", SPE Journal "
    "12, 20: the pellet bed as a solid plug pushed by barrel friction "
    "against screw friction; the feed capacity and the pressure it "
    "builds.",
    "Tadmor (1966), \"Fundamentals of plasticating extrusion\", Polymer "
    "Engineering and Science 6, 185: melting of a contiguous solid bed "
    "by a melt film at the barrel, heated by conduction and shear.",
    "Tadmor & Klein (1970), Engineering Principles of Plasticating "
    "Extrusion: the screw as one chain of solids conveying, melting and "
    "melt conveying, and the geometry of the helical channel.",
    "Kacir & Tadmor (1972), \"Solids conveying in screw extruders. Part "
    "III: the delay zone\", Polymer Engineering and Science 12, 387: the "
    "melt film between barrel and plug that must outgrow the flight "
    "clearance before a melt pool forms; with Carslaw & Jaeger (1959), "
    "Conduction of Heat in Solids, for the heating of the plug.",
    "Tadmor & Gogos (2006), Principles of Polymer Processing, 2nd ed.: "
    "conveying of shear-thinning melts, leakage over the flights, and "
    "the match of screw and die that sets the throughput.",
    "Bird, Stewart & Lightfoot (2002), Transport Phenomena, 2nd ed.: the "
    "momentum and energy balances across the channel depth, viscous "
    "heating and conduction to the barrel and the screw.",
    "Dealy & Wissbrun (1990), Melt Rheology and its Role in Plastics "
    "Processing: the viscosity models of the resin and their shift with "
    "temperature.",
    "Rauwendaal, Polymer Extrusion, and Tadmor & Gogos (2006): the flow "
    "of melt over the barrier lands of a fluted mixer, drag across the "
    "land against the pressure it builds.",
    "Each barrel zone as a controlled wall: its control point at the "
    "set-point behind a heat-transfer coefficient to the bore, within the "
    "zone's heating and cooling power; a zone that needs more floats to "
    "the temperature at which its power is enough.",
};

static const char *const left_out[] = {
    "break-up of the solid bed",
    "in the delay zone, the contact resistance of a loose pellet plug at "
    "the barrel (full contact is assumed, which shortens the zone) and "
    "melt films on the flights and the screw root",
    "the effect of pressure on viscosity",
    "slip of the melt or the pellets at the walls",
    "melt elasticity (normal stresses, die swell)",
    "eccentricity of the screw in the barrel, beyond its share in the "
    "leakage over the flights",
    "venting",
    "surging and every transient: start-up, changes of settings, "
    "purging",
    "heat lost from the barrel to the room, and conduction along the "
    "barrel between zones",
};

/* Our own words; each caution is a paragraph with a bold lead. */
static const struct ow_doc_caution cautions[] = {
    {"Hot melt and pressure can injure.",
     "Melt at these temperatures "
     "burns on contact and sticks to skin. Melt can spray from the die, "
     "the adapter or a vent without warning when pressure is released. "
     "Die and adapter bolts and clamps hold the whole head pressure: "
     "never loosen them, or open the die, while the barrel is hot and "
     "the melt may be under pressure."},
    {"The machine's own ratings come first.",
     "The extruder builder's "
     "ratings for drive power, torque, speed, barrel pressure and "
     "temperature, and the rating of the barrel's rupture disc, govern "
     "wherever they are stricter than a limit used here. A pressure "
     "limit in this report is no substitute for a working rupture disc "
     "and pressure alarm."},
    {"Verify every setting on the line.",
     "The figures are estimates "
     "from published engineering models, not measurements. Start inside "
     "the window, at or near the centre point; change one setting at a "
     "time and watch melt pressure, melt temperature and drive load "
     "settle before going on. Stop and review if the line behaves "
     "differently from this report."},
    {"Local codes and licensed practice govern.",
     "Safety regulations, "
     "guarding, lock-out and the approval of a qualified engineer, "
     "where local rules require one, come before anything in this "
     "report."},
};

#define N_OF(a) ((int)(sizeof(a) / sizeof((a)[0])))

static void model_basis(struct rpt *r)
{
	struct ow_doc_style st = ow_doc_body();
	int k;

	ow_doc_heading(&r->doc, "Model basis", 80.0);
	ow_doc_para(&r->doc,
	            "Each operating point is solved from the hopper to the "
	            "die with published engineering models:",
	            &st, 4.0);
	for (k = 0; k < N_OF(methods); k++)
		ow_doc_bullet(&r->doc, methods[k], &st);
	r->doc.y += 4.0;
	ow_doc_para(&r->doc,
	            "Rules of thumb in the screw warnings are common practice "
	            "and are marked so.",
	            &st, 0.0);
}

static void leaves_out(struct rpt *r)
{
	struct ow_doc_style st = ow_doc_body();
	int k;

	ow_doc_heading(&r->doc, "What the model leaves out", 80.0);
	for (k = 0; k < N_OF(left_out); k++)
		ow_doc_bullet(&r->doc, left_out[k], &st);
	r->doc.y += 4.0;
	st.bold = 1;
	ow_doc_para(&r->doc,
	            "The results are estimates from published engineering "
	            "models, not measurements. Check them on the line.",
	            &st, 0.0);
}

void ow_report_basis(struct rpt *r)
{
	if (r->doc.st != OW_OK)
		return;
	ow_doc_need(&r->doc, 200.0);
	model_basis(r);
	leaves_out(r);
	ow_doc_cautions(&r->doc, cautions, N_OF(cautions),
	                OW_DOC_CAUTIONS_BARRED);
	ow_doc_check(&r->doc);
}
