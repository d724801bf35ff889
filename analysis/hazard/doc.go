// Package hazard turns the hazard classes in the element table into short
// bench cautions for a set of elements, and lists the general cautions of
// arc melting and melt spinning.
//
// The cautions are reminders written for people who already work under a
// laboratory's safety system; every list ends by deferring to local rules,
// the safety officer and trained staff. They are not a risk assessment.
package hazard
